import "server-only";
import { and, eq, lt, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { mailOutbox } from "../schema";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/** Queues a message in the caller's transaction; it is delivered after the transaction commits. */
export async function insertMail(tx: Tx, mail: OutgoingMail) {
  await tx.insert(mailOutbox).values({ toAddress: mail.to, subject: mail.subject, textBody: mail.text, htmlBody: mail.html ?? null });
}

/**
 * Claims up to `limit` pending messages for delivery by bumping their attempt count inside a row lock,
 * so two delivery loops never send the same message twice.
 */
export async function claimPendingMail(limit: number, maxAttempts: number) {
  return db.transaction(async (tx) => {
    const rows = await tx
      .select()
      .from(mailOutbox)
      .where(and(eq(mailOutbox.status, "pending"), lt(mailOutbox.attempts, maxAttempts)))
      .orderBy(mailOutbox.id)
      .limit(limit)
      .for("update", { skipLocked: true });
    for (const row of rows) {
      await tx.update(mailOutbox).set({ attempts: sql`${mailOutbox.attempts} + 1` }).where(eq(mailOutbox.id, row.id));
    }
    return rows;
  });
}

export async function updateMailSent(id: number) {
  await db.update(mailOutbox).set({ status: "sent", sentAt: new Date(), lastError: null }).where(eq(mailOutbox.id, id));
}

/** Leaves the message pending for another try, or marks it failed once it has used its attempts. */
export async function updateMailFailed(id: number, error: string, giveUp: boolean) {
  await db
    .update(mailOutbox)
    .set({ lastError: error.slice(0, 1000), status: giveUp ? "failed" : "pending" })
    .where(eq(mailOutbox.id, id));
}
