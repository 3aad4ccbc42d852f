import "server-only";
import { eq, lt } from "drizzle-orm";
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

/** Replaces one stored value (a value clears the reason and a reason clears the value). */
export async function updateObservation(tx: Tx, p: { id: number; value: CellValue; missingReason: MissingReason | null; recordedById: number; observedOn: string }) {
  await tx
    .update(observations)
    .set({ valueNumber: p.value.valueNumber, valueDate: p.value.valueDate, valueText: p.value.valueText, missingReason: p.missingReason, recordedById: p.recordedById, observedOn: p.observedOn })
    .where(eq(observations.id, p.id));
}

/** Audit entries for a batch of recorded values, in batches. */
export async function insertObservationAudits(tx: Tx, rows: AuditEntry[]) {
  for (let i = 0; i < rows.length; i += BATCH) await tx.insert(auditLog).values(rows.slice(i, i + BATCH));
}

/** Opens the site's data set as a draft for review, unless it already has one. */
export async function insertDraftSubmission(tx: Tx, enrolmentId: number) {
  const [sub] = await tx.select({ id: submissions.id }).from(submissions).where(eq(submissions.enrolmentId, enrolmentId));
  if (!sub) await tx.insert(submissions).values({ enrolmentId, status: "draft" });
}

/** Keeps the answer to a save sent with the phone's own id; a second row for the same user and id fails on the unique key. */
export async function insertClientSave(tx: Tx, row: typeof clientSaves.$inferInsert) {
  await tx.insert(clientSaves).values(row);
}

/** Forgets the answers to phone saves older than 90 days (a phone that kept a value longer has it checked again). Run by the background job. */
export async function deleteOldClientSaves() {
  await db.delete(clientSaves).where(lt(clientSaves.createdAt, new Date(Date.now() - 90 * 24 * 3600_000)));
}
