import "server-only";
import { insertPasswordReset } from "@/db/mutations/users";
import { passwordResetMail } from "@/lib/domain/mail/templates";
import { deliverQueuedMail } from "@/server/mail/outbox";
import { env } from "@/lib/env";
import { newToken } from "./tokens";

/**
 * Issues a reset link when the e-mail belongs to an active account with a password (voiding earlier
 * links), and delivers it. Runs after the answer to the request has been sent, so the answer does the
 * same work, and takes the same time, whether or not the account exists. Never throws: there is nobody
 * left to tell.
 */
export async function sendPasswordResetLink(email: string): Promise<void> {
  try {
    const token = newToken();
    const queued = await insertPasswordReset({
      email,
      token,
      buildMail: (name) => passwordResetMail({ to: email, name, link: `${env.APP_URL}/reset-password/${token}` }),
    });
    if (queued) await deliverQueuedMail();
  } catch (e) {
    console.error("[auth] reset link not issued:", e instanceof Error ? e.message : e);
  }
}
