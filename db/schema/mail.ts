import { index, int, mediumtext, mysqlEnum, mysqlTable, text, timestamp, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id } from "./columns";
import { MAIL_STATUSES } from "@/lib/domain/vocabulary/enums";

/**
 * Outgoing mail. Every message is written here in the same transaction as the action that caused it,
 * then delivered; if the mail server is down it stays pending and is retried, so the action still succeeds.
 */
export const mailOutbox = mysqlTable(
  "mail_outbox",
  {
    id: id(),
    toAddress: varchar("to_address", { length: 254 }).notNull(),
    subject: varchar("subject", { length: 250 }).notNull(),
    textBody: mediumtext("text_body").notNull(),
    htmlBody: mediumtext("html_body"),
    status: mysqlEnum("status", MAIL_STATUSES).notNull().default("pending"),
    attempts: int("attempts").notNull().default(0),
    // Set while one delivery run is sending the message, so another run (the retry timer, another
    // action's delivery, another server process) does not send it a second time; a run that died
    // leaves it to expire, and the message is tried again.
    claimedUntil: timestamp("claimed_until", { mode: "date" }),
    lastError: text("last_error"),
    createdAt: createdAt(),
    sentAt: timestamp("sent_at", { mode: "date" }),
  },
  (t) => [index("mail_outbox_status_idx").on(t.status, t.createdAt)],
);
