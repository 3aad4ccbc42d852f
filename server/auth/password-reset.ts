import "server-only";
import { db } from "@/db/index";
import { insertPasswordReset, lockActiveAccountByEmail } from "@/db/mutations/users";
import { passwordResetMail } from "@/lib/domain/mail/templates";
import { deliverQueuedMail } from "@/server/mail/outbox";
import { env } from "@/lib/env";
import { hashToken, newToken } from "./tokens";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

const RESET_MINUTES = 60;

/**
 * Stores a reset link and queues its mail, in one transaction, when the e-mail belongs to an active account
 * with a password; answers whether it did. `token` is drawn fresh unless a test needs to know it.
 */
export async function issuePasswordReset(p: { email: string; token?: string }): Promise<boolean> {
  const token = p.token ?? newToken();
  return db.transaction(async (tx) => {
    const account = await lockActiveAccountByEmail(tx, p.email);
    if (!account || !account.hasPassword) return false;
    await insertPasswordReset(tx, {
      userId: account.id,
      tokenHash: hashToken(token),
      expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000),
      mail: passwordResetMail({ to: p.email, name: account.name, link: `${env.APP_URL}${withLanguage(`/reset-password/${token}`, account.locale)}`, locale: account.locale }),
    });
    return true;
  });
}

/**
 * Issues a reset link when the e-mail belongs to an active account with a password (voiding earlier
 * links), and delivers it. Runs after the answer to the request has been sent, so the answer does the
 * same work, and takes the same time, whether or not the account exists. Never throws: there is nobody
 * left to tell.
 */
export async function sendPasswordResetLink(email: string): Promise<void> {
  try {
    if (await issuePasswordReset({ email })) await deliverQueuedMail();
  } catch (e) {
    console.error("[auth] reset link not issued:", e instanceof Error ? e.message : e);
  }
}
