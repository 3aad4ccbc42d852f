import "server-only";
import { after } from "next/server";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";
import { claimPendingMail, updateMailFailed, updateMailSent } from "@/db/mutations/mail";

const MAX_ATTEMPTS = 20;
let transporter: Transporter | null = null;

function getTransport(): Transporter {
  transporter ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: false,
    // The local capture server speaks plain SMTP on loopback.
    ignoreTLS: env.MAIL_MODE === "capture",
    connectionTimeout: 3000,
    greetingTimeout: 3000,
    socketTimeout: 5000,
  });
  return transporter;
}

/**
 * Sends queued mail. Called right after an action commits, and on a timer, so mail queued while the
 * mail server was down goes out once it is back. Returns how many were sent.
 */
export async function deliverPendingMail(limit = 50): Promise<number> {
  const batch = await claimPendingMail(limit, MAX_ATTEMPTS);
  let sent = 0;
  for (const mail of batch) {
    try {
      await getTransport().sendMail({
        from: env.MAIL_FROM,
        to: mail.toAddress,
        subject: mail.subject,
        text: mail.textBody,
        html: mail.htmlBody ?? undefined,
      });
      await updateMailSent(mail.id);
      sent += 1;
    } catch (e) {
      await updateMailFailed(mail.id, e instanceof Error ? e.message : String(e), mail.attempts + 1 >= MAX_ATTEMPTS);
    }
  }
  return sent;
}

/** Delivers queued mail now; a mail-server problem is logged and left to the retry timer, never thrown. */
export async function deliverQueuedMail(): Promise<void> {
  try {
    await deliverPendingMail();
  } catch (e) {
    console.error("[mail] delivery deferred:", e instanceof Error ? e.message : e);
  }
}

/**
 * Delivery after an action has queued mail. During a request it runs once the response has gone out
 * (Next's `after`), so no answer waits on the mail server, and a slow or missing mail server cannot
 * slow an action or show in its timing. Outside a request (timers, scripts) it delivers right away.
 */
export async function deliverSoon(): Promise<void> {
  try {
    after(deliverQueuedMail);
    return;
  } catch {
    // `after` refuses outside a request scope: there is no response to wait for.
  }
  await deliverQueuedMail();
}
