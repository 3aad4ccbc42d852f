import "server-only";
import { lt, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { auditLog, clientSaves, observationHistory, observations, submissions } from "../schema";
import type { CellValue } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";

// Prepared rows only: server/observations decides what is new, changed or refused, inside its transaction.

const BATCH = 500;

export interface NewObservation extends CellValue {
  plotId: number;
  traitId: number;
  occasion: number;
  observedOn: string;
  missingReason: MissingReason | null;
  recordedById: number;
}

export type AuditEntry = typeof auditLog.$inferInsert;

/** Inserts new values in batches and returns their ids in the same order. */
export async function insertObservations(tx: Tx, rows: NewObservation[]): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < rows.length; i += BATCH) {
    const inserted = await tx.insert(observations).values(rows.slice(i, i + BATCH)).$returningId();
    ids.push(...inserted.map((r) => r.id));
  }
  return ids;
}

/** Keeps the earlier values of observations about to change. */
export async function insertObservationHistory(tx: Tx, rows: (typeof observationHistory.$inferInsert)[]) {
  for (let i = 0; i < rows.length; i += BATCH) await tx.insert(observationHistory).values(rows.slice(i, i + BATCH));
}

/**
 * Replaces stored values (a value clears the reason and a reason clears the value), each row naming its
 * observation by id, in one statement per batch rather than one per value: every row exists, so MariaDB's
 * INSERT ... ON DUPLICATE KEY UPDATE only ever takes the update branch.
 */
export async function updateObservations(tx: Tx, rows: (NewObservation & { id: number })[]) {
  const replaced = (column: string) => sql`values(${sql.identifier(column)})`;
  for (let i = 0; i < rows.length; i += BATCH) {
    await tx
      .insert(observations)
      .values(rows.slice(i, i + BATCH))
      .onDuplicateKeyUpdate({
        set: {
          valueNumber: replaced("value_number"),
          valueDate: replaced("value_date"),
          valueText: replaced("value_text"),
          missingReason: replaced("missing_reason"),
          recordedById: replaced("recorded_by_id"),
          observedOn: replaced("observed_on"),
        },
      });
  }
}

/** Audit entries for a batch of recorded values, in batches. */
export async function insertObservationAudits(tx: Tx, rows: AuditEntry[]) {
  for (let i = 0; i < rows.length; i += BATCH) await tx.insert(auditLog).values(rows.slice(i, i + BATCH));
}

/** Opens the site's data set as a draft for review; the caller, holding the enrolment's lock, saw none. */
export async function insertDraftSubmission(tx: Tx, enrolmentId: number) {
  await tx.insert(submissions).values({ enrolmentId, status: "draft" });
}

/** Keeps the answer to a save sent with the phone's own id; a second row for the same user and id fails on the unique key. */
export async function insertClientSave(tx: Tx, row: typeof clientSaves.$inferInsert) {
  await tx.insert(clientSaves).values(row);
}

/** Forgets the answers to phone saves older than 90 days (a phone that kept a value longer has it checked again). Run by the background job. */
export async function deleteOldClientSaves() {
  await db.delete(clientSaves).where(lt(clientSaves.createdAt, new Date(Date.now() - 90 * 24 * 3600_000)));
}
