import "server-only";
import { and, eq, inArray, isNull, lt, or, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { mailOutbox } from "../schema";
import type { OutgoingMail } from "@/lib/domain/mail/templates";

/** Queues a message in the caller's transaction; it is delivered after the transaction commits. */
export async function insertMail(tx: Tx, mail: OutgoingMail) {
  await tx.insert(mailOutbox).values({ toAddress: mail.to, subject: mail.subject, textBody: mail.text, htmlBody: mail.html ?? null });
}

// Longer than one send can take (nodemailer's connection, greeting and socket timeouts in server/mail/outbox.ts).
const CLAIM_SECONDS = 120;

/**
 * Claims up to `limit` pending messages for delivery: bumps their attempt count and marks them claimed
 * for a while, inside a row lock, so two delivery runs never send the same message twice (a message
 * claimed by a run that is still sending is skipped).
 */
export async function claimPendingMail(limit: number, maxAttempts: number) {
  return db.transaction(async (tx) => {
    const now = new Date();
    const rows = await tx
      .select()
      .from(mailOutbox)
      .where(
        and(
          eq(mailOutbox.status, "pending"),
          lt(mailOutbox.attempts, maxAttempts),
          or(isNull(mailOutbox.claimedUntil), lt(mailOutbox.claimedUntil, now)),
        ),
      )
      .orderBy(mailOutbox.id)
      .limit(limit)
      .for("update", { skipLocked: true });
    if (rows.length > 0) {
      await tx
        .update(mailOutbox)
        .set({ attempts: sql`${mailOutbox.attempts} + 1`, claimedUntil: new Date(now.getTime() + CLAIM_SECONDS * 1000) })
        .where(inArray(mailOutbox.id, rows.map((r) => r.id)));
    }
    return rows;
  });
}

export async function updateMailSent(id: number) {
  await db.update(mailOutbox).set({ status: "sent", sentAt: new Date(), lastError: null, claimedUntil: null }).where(eq(mailOutbox.id, id));
}

/** Leaves the message pending for another try, or marks it failed once it has used its attempts. */
export async function updateMailFailed(id: number, error: string, giveUp: boolean) {
  await db
    .update(mailOutbox)
    .set({ lastError: error.slice(0, 1000), status: giveUp ? "failed" : "pending", claimedUntil: null })
    .where(eq(mailOutbox.id, id));
}
