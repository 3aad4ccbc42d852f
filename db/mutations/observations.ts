import "server-only";
import { lt, sql } from "drizzle-orm";
import type { AnyMySqlColumn } from "drizzle-orm/mysql-core";
import type { ResultSetHeader } from "mysql2";
import { db, type Tx } from "../index";
import { fixedSql } from "../fixed-sql";
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

export interface ObservationHistoryRow extends CellValue {
  observationId: number;
  changedById: number | null;
}

// Every save runs these inserts, so each is one SQL template around text rendered once (fixedSql) rather than
// the query builder, whose building cost more than the rest of the statement in this process. Values are
// sent as the builder sends them: DECIMAL as its text, JSON as its text.
const COMMA = sql`, `;
const columnNames = (...columns: AnyMySqlColumn[]) => sql.join(columns.map((c) => sql.identifier(c.name)), COMMA);
const decimalText = (value: number | null) => (value === null ? null : String(value));
const jsonText = (value: unknown) => (value === null || value === undefined ? null : JSON.stringify(value));

const OBSERVATION_COLUMNS = columnNames(
  observations.plotId,
  observations.traitId,
  observations.occasion,
  observations.observedOn,
  observations.valueNumber,
  observations.valueDate,
  observations.valueText,
  observations.missingReason,
  observations.recordedById,
);
const INSERT_OBSERVATIONS = fixedSql(sql`INSERT INTO ${observations} (${OBSERVATION_COLUMNS}) VALUES `);
/** One row's values in OBSERVATION_COLUMNS order. */
const observationFields = (r: NewObservation) =>
  sql`${r.plotId}, ${r.traitId}, ${r.occasion}, ${r.observedOn}, ${decimalText(r.valueNumber)}, ${r.valueDate}, ${r.valueText}, ${r.missingReason}, ${r.recordedById}`;

/**
 * Inserts new values in batches and returns their ids in the same order: a batch's rows take consecutive ids
 * from the first one MariaDB reports, as Drizzle's $returningId counts them.
 */
export async function insertObservations(tx: Tx, rows: NewObservation[]): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < rows.length; i += BATCH) {
    const batch = rows.slice(i, i + BATCH);
    const [result] = (await tx.execute(sql`${INSERT_OBSERVATIONS}${sql.join(batch.map((r) => sql`(${observationFields(r)})`), COMMA)}`)) as unknown as [ResultSetHeader];
    for (let k = 0; k < batch.length; k += 1) ids.push(result.insertId + k);
  }
  return ids;
}

const INSERT_HISTORY = fixedSql(
  sql`INSERT INTO ${observationHistory} (${columnNames(observationHistory.observationId, observationHistory.valueNumber, observationHistory.valueDate, observationHistory.valueText, observationHistory.changedById)}) VALUES `,
);

/** Keeps the earlier values of observations about to change. */
export async function insertObservationHistory(tx: Tx, rows: ObservationHistoryRow[]) {
  for (let i = 0; i < rows.length; i += BATCH) {
    const values = rows.slice(i, i + BATCH).map((r) => sql`(${r.observationId}, ${decimalText(r.valueNumber)}, ${r.valueDate}, ${r.valueText}, ${r.changedById})`);
    await tx.execute(sql`${INSERT_HISTORY}${sql.join(values, COMMA)}`);
  }
}

const replaced = (column: AnyMySqlColumn) => sql`${sql.identifier(column.name)} = VALUES(${sql.identifier(column.name)})`;
const REPLACE_OBSERVATIONS = {
  insert: fixedSql(sql`INSERT INTO ${observations} (${columnNames(observations.id)}, ${OBSERVATION_COLUMNS}) VALUES `),
  update: fixedSql(
    sql` ON DUPLICATE KEY UPDATE ${sql.join(
      [observations.valueNumber, observations.valueDate, observations.valueText, observations.missingReason, observations.recordedById, observations.observedOn].map(replaced),
      COMMA,
    )}`,
  ),
};

/**
 * Replaces stored values (a value clears the reason and a reason clears the value), each row naming its
 * observation by id, in one statement per batch rather than one per value: every row exists, so MariaDB's
 * INSERT ... ON DUPLICATE KEY UPDATE only ever takes the update branch.
 */
export async function updateObservations(tx: Tx, rows: (NewObservation & { id: number })[]) {
  for (let i = 0; i < rows.length; i += BATCH) {
    const values = rows.slice(i, i + BATCH).map((r) => sql`(${r.id}, ${observationFields(r)})`);
    await tx.execute(sql`${REPLACE_OBSERVATIONS.insert}${sql.join(values, COMMA)}${REPLACE_OBSERVATIONS.update}`);
  }
}

const INSERT_AUDITS = fixedSql(
  sql`INSERT INTO ${auditLog} (${columnNames(auditLog.actorId, auditLog.action, auditLog.entity, auditLog.entityId, auditLog.trialId, auditLog.oldValue, auditLog.newValue)}) VALUES `,
);

/** Audit entries for a batch of recorded values, in batches. */
export async function insertObservationAudits(tx: Tx, rows: AuditEntry[]) {
  for (let i = 0; i < rows.length; i += BATCH) {
    const values = rows
      .slice(i, i + BATCH)
      .map((r) => sql`(${r.actorId ?? null}, ${r.action}, ${r.entity}, ${r.entityId}, ${r.trialId ?? null}, ${jsonText(r.oldValue)}, ${jsonText(r.newValue)})`);
    await tx.execute(sql`${INSERT_AUDITS}${sql.join(values, COMMA)}`);
  }
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
