import "server-only";
import { and, asc, eq, inArray, isNull, or, sql, type SQL } from "drizzle-orm";
import { db, type Tx } from "../index";
import { clientSaves, enrolments, observations, plots, reviewComments, seedLots, sites, submissions, trialEntries, trialTraits, traits, trials, users } from "../schema";
import { cooperatorEnrolmentScope, staffTrialScope } from "../access";
import { plotLayoutFields } from "./trial-parts";
import { fixedSql } from "../fixed-sql";
import type { Viewer } from "@/lib/domain/viewer";
import type { TraitForColumns } from "@/lib/domain/observations/columns";
import type { CellValue } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";
import type { SubmissionStatus, TraitComputation, TraitType, TrialStatus } from "@/lib/domain/vocabulary/enums";

/** Enrolments the viewer may record for: a cooperator's own sites, or the trials a staff member manages. */
export function recordScope(viewer: Viewer): SQL {
  if (viewer.role === "cooperator") return cooperatorEnrolmentScope(viewer);
  return staffTrialScope(viewer);
}

type Executor = Tx | typeof db;

/**
 * One enrolment (site in a trial) the viewer may record for; null otherwise. With `lock`, for the rest of the
 * transaction the enrolment row is locked for writing (saves for one site run one after another) and the
 * trial row for reading only, so saves at different sites of a trial run side by side while a change of
 * the trial's status (which locks the trial for writing) waits for them, and they for it. The trial is
 * locked before the enrolment, in the order every use case that changes a trial takes them, so the two
 * never deadlock. The locking statements name rows by id only (a grower's by their own sites): the ownership check is the read after them,
 * which, coming after the locks, also starts the transaction's snapshot, so every later read sees the
 * latest committed values.
 */
export async function getRecordableEnrolment(ex: Executor, viewer: Viewer, p: { trialId: number; siteId: number }, lock = false) {
  if (lock) await lockRecordableEnrolment(ex, viewer, p);
  const [row] = await ex
    .select(recordableEnrolmentFields)
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .leftJoin(submissions, eq(submissions.enrolmentId, enrolments.id))
    .where(recordableEnrolmentWhere(viewer, p));
  return row ?? null;
}

/** The two locking statements of getRecordableEnrolment(…, lock): the trial row for reading, the site's enrolment row for writing. */
async function lockRecordableEnrolment(ex: Executor, viewer: Viewer, p: { trialId: number; siteId: number }) {
  // MariaDB has no FOR SHARE; a FOR UPDATE over a join would lock the trial row for writing too.
  await ex.execute(sql`SELECT ${trials.id} FROM ${trials} WHERE ${trials.id} = ${p.trialId} LOCK IN SHARE MODE`);
  // A grower locks only their own sites' rows; staff scope needs the trial row, checked by the read after the locks.
  const own = viewer.role === "cooperator" ? cooperatorEnrolmentScope(viewer) : undefined;
  await ex.select({ id: enrolments.id }).from(enrolments).where(and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId), own)).for("update");
}

const recordableEnrolmentFields = {
  enrolmentId: enrolments.id,
  trialId: trials.id,
  trialCode: trials.code,
  trialTitle: trials.title,
  trialStatus: trials.status,
  plotUnit: trials.plotUnit,
  plotSize: trials.plotSize,
  programId: trials.programId,
  siteId: sites.id,
  siteName: sites.name,
  sownOn: enrolments.sownOn,
  transplantedOn: enrolments.transplantedOn,
  cooperatorId: enrolments.cooperatorId,
  /** the review state of the site's data set; null before anything was recorded */
  submissionStatus: submissions.status,
};

const recordableEnrolmentWhere = (viewer: Viewer, p: { trialId: number; siteId: number }) => and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId), recordScope(viewer));

export type RecordableEnrolment = NonNullable<Awaited<ReturnType<typeof getRecordableEnrolment>>>;

/** What the recording form's columns and the schedule read of a trait (see entryColumns). */
export const traitColumnFields = {
  id: traits.id,
  code: traits.code,
  name: traits.name,
  unit: traits.unit,
  valueType: traits.valueType,
  minValue: traits.minValue,
  maxValue: traits.maxValue,
  dueDaysAfterSowing: traits.dueDaysAfterSowing,
  dueByDay: traits.dueByDay,
  dueNote: traits.dueNote,
  computation: traits.computation,
};

/** The traits recorded in a trial, in the trial's trait order (server/observations turns them into columns). */
export async function listTrialTraits(ex: Executor, trialId: number): Promise<TraitForColumns[]> {
  return ex
    .select(traitColumnFields)
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .where(eq(trialTraits.trialId, trialId))
    .orderBy(asc(trialTraits.sortOrder), asc(trialTraits.id));
}

/** What a save checks its values against, of the trial and of the site (see getSaveTarget). */
export interface SaveSite {
  enrolmentId: number;
  trialId: number;
  trialStatus: TrialStatus;
  sownOn: string | null;
  transplantedOn: string | null;
  /** the review state of the site's data set; null before anything was recorded */
  submissionStatus: SubmissionStatus | null;
}

/**
 * The trial and site a save writes to, with the trial's traits in the trial's trait order; null when the
 * site is not the viewer's to record (a grower's own sites, the trials a staff member manages: recordScope).
 * Two reads. With `lock`, the first takes the trial row for reading (LOCK IN SHARE MODE, with its trait rows),
 * so saves at the trial's other sites run alongside while a change of its status or traits (which lock the
 * trial for writing first) waits; the second then takes the site's enrolment row for writing, so saves for
 * one site run one after another. Locking reads start no snapshot: the first plain read of the transaction is
 * the review state read inside the second statement, once the site's row is held, so it and every later read
 * (the plots' stored values) see the latest committed save. Neither locking read may hold another subquery that
 * runs before the site's row is taken: a subquery inside a locking read is a plain read and would start the
 * snapshot early. So the first read names the trial by id only; a grower's ownership check is the second, scoped
 * to their own sites (evaluated on the row once held); a staff member's programs are checked by a third read
 * after both locks.
 */
export async function getSaveTarget(ex: Executor, viewer: Viewer, p: { trialId: number; siteId: number }, lock = false): Promise<{ site: SaveSite; traits: TraitForColumns[] } | null> {
  const grower = viewer.role === "cooperator";
  const [traitRows] = (await ex.execute(
    sql`${SAVE_TRIAL.select}${p.trialId}${SAVE_TRIAL.order}${lock ? SHARE_LOCK : NOTHING}`,
  )) as unknown as [SaveTraitRow[]];
  if (traitRows.length === 0) return null;
  const [siteRows] = (await ex.execute(
    sql`${SAVE_SITE.select}${p.trialId}${SAVE_SITE.andSite}${p.siteId}${grower ? sql` AND ${cooperatorEnrolmentScope(viewer)}` : NOTHING}${lock ? UPDATE_LOCK : NOTHING}`,
  )) as unknown as [SaveSiteRow[]];
  const row = siteRows[0];
  if (!row) return null;
  if (!grower) {
    const [managed] = await ex.select({ id: trials.id }).from(trials).where(and(eq(trials.id, p.trialId), staffTrialScope(viewer)));
    if (!managed) return null;
  }
  const site: SaveSite = { enrolmentId: row.id, trialId: p.trialId, trialStatus: traitRows[0]!.trial_status, sownOn: row.sown_on, transplantedOn: row.transplanted_on, submissionStatus: row.submission_status };
  const traitList: TraitForColumns[] = [];
  for (const r of traitRows) {
    if (r.id === null) continue;
    traitList.push({
      id: r.id,
      code: r.code,
      name: r.name,
      unit: r.unit,
      valueType: r.value_type,
      minValue: r.min_value === null ? null : Number(r.min_value),
      maxValue: r.max_value === null ? null : Number(r.max_value),
      dueDaysAfterSowing: r.due_days,
      dueByDay: r.due_by_day,
      dueNote: r.due_note,
      computation: r.computation,
    });
  }
  return { site, traits: traitList };
}

const NOTHING = sql``;
const SHARE_LOCK = sql` LOCK IN SHARE MODE`;
const UPDATE_LOCK = sql` FOR UPDATE`;

/** getSaveTarget's first read: the trial's status and its traits in the trial's order (none: one row with no trait). */
const SAVE_TRIAL = {
  select: fixedSql(sql`SELECT ${trials.status} AS trial_status, ${traits.id} AS id, ${traits.code} AS code, ${traits.name} AS name, ${traits.unit} AS unit,
      ${traits.valueType} AS value_type, ${traits.minValue} AS min_value, ${traits.maxValue} AS max_value,
      ${traits.dueDaysAfterSowing} AS due_days, ${traits.dueByDay} AS due_by_day, ${traits.dueNote} AS due_note, ${traits.computation} AS computation
    FROM ${trials} LEFT JOIN ${trialTraits} ON ${trialTraits.trialId} = ${trials.id} LEFT JOIN ${traits} ON ${traits.id} = ${trialTraits.traitId}
    WHERE ${trials.id} = `),
  order: fixedSql(sql` ORDER BY ${trialTraits.sortOrder}, ${trialTraits.id}`),
};

/** getSaveTarget's second read: the site's enrolment, and the review state of its data set (a plain read, made once the row is held). */
const SAVE_SITE = {
  select: fixedSql(sql`SELECT ${enrolments.id} AS id, ${enrolments.sownOn} AS sown_on, ${enrolments.transplantedOn} AS transplanted_on,
      (SELECT s.status FROM ${submissions} s WHERE s.enrolment_id = ${enrolments.id}) AS submission_status
    FROM ${enrolments} WHERE ${enrolments.trialId} = `),
  andSite: fixedSql(sql` AND ${enrolments.siteId} = `),
};

/** A row of getSaveTarget's first read, as the driver returns it: the trial's status, and one trait or none. */
interface SaveTraitRow {
  trial_status: TrialStatus;
  id: number | null;
  code: string;
  name: string;
  unit: string | null;
  value_type: TraitType;
  /** DECIMAL: a number (the pool reads decimals as numbers), or its text from a driver that does not */
  min_value: string | number | null;
  max_value: string | number | null;
  /** the driver reads JSON columns itself, as the query builder's rows */
  due_days: number[] | null;
  due_by_day: number | null;
  due_note: string | null;
  computation: TraitComputation;
}

interface SaveSiteRow {
  id: number;
  sown_on: string | null;
  transplanted_on: string | null;
  submission_status: SubmissionStatus | null;
}

/** Plots of an enrolment in layout order (block, then position), with blind codes only. */
/** `onlyPlots` narrows the rows to those plots of the enrolment (a save that names its plots by id). */
const plotFilter = (enrolmentId: number, onlyPlots?: number[]) =>
  onlyPlots && onlyPlots.length > 0 ? and(eq(plots.enrolmentId, enrolmentId), inArray(plots.id, onlyPlots)) : eq(plots.enrolmentId, enrolmentId);

export async function listEnrolmentPlots(ex: Executor, enrolmentId: number, onlyPlots?: number[]) {
  return ex
    .select(plotLayoutFields)
    .from(plots)
    .innerJoin(trialEntries, eq(trialEntries.id, plots.entryId))
    .where(plotFilter(enrolmentId, onlyPlots))
    .orderBy(asc(plots.block), asc(plots.position));
}
export type EnrolmentPlot = Awaited<ReturnType<typeof listEnrolmentPlots>>[number];

/**
 * Days to maturity printed on the seed packet of each plot's entry (null when the entry has no seed lot or
 * the packet gives none), by plot id. Unblinding data: server-side checks and staff pages only, never sent
 * to a grower.
 */
export async function listPlotPacketDays(ex: Executor, enrolmentId: number, onlyPlots?: number[]): Promise<Record<number, number | null>> {
  const rows = await ex
    .select({ plotId: plots.id, packetDays: seedLots.packetDaysToMaturity })
    .from(plots)
    .innerJoin(trialEntries, eq(trialEntries.id, plots.entryId))
    .leftJoin(seedLots, eq(seedLots.id, trialEntries.seedLotId))
    .where(plotFilter(enrolmentId, onlyPlots));
  return Object.fromEntries(rows.map((r) => [r.plotId, r.packetDays]));
}

export interface ObservationRow extends CellValue {
  id: number;
  plotId: number;
  traitId: number;
  occasion: number;
  missingReason: MissingReason | null;
}

/** Recorded values of an enrolment, by plot, trait and occasion (day after sowing, 0 for unscheduled traits). */
export async function listEnrolmentObservations(ex: Executor, enrolmentId: number, onlyPlots?: number[]): Promise<ObservationRow[]> {
  const rows = await ex
    .select({ id: observations.id, plotId: observations.plotId, traitId: observations.traitId, occasion: observations.occasion, valueNumber: observations.valueNumber, valueDate: observations.valueDate, valueText: observations.valueText, missingReason: observations.missingReason })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(plotFilter(enrolmentId, onlyPlots));
  return rows.map((r) => ({ ...r, valueNumber: r.valueNumber === null ? null : Number(r.valueNumber) }));
}

/**
 * What a save checks its values against, in one read: the enrolment's plots (all, or only `onlyPlots`), their
 * stored values and the days to maturity on each plot's seed packet. The packet days are unblinding data: for
 * the server's checks only, never sent to a grower.
 */
export async function listPlotsForSave(ex: Executor, enrolmentId: number, onlyPlots?: number[]) {
  // Text rendered once rather than the query builder's select: every save runs it, and building and mapping
  // the builder's joined select cost more than the rest of the read.
  const named = onlyPlots && onlyPlots.length > 0 ? sql`${PLOTS_FOR_SAVE.andPlotIn}${onlyPlots}` : NOTHING;
  const [rows] = (await ex.execute(sql`${PLOTS_FOR_SAVE.select}${enrolmentId}${named}`)) as unknown as [PlotForSaveRow[]];
  const plotRows: { id: number; plotCode: string }[] = [];
  const stored: ObservationRow[] = [];
  const packetDays: Record<number, number | null> = {};
  for (const r of rows) {
    if (!(r.id in packetDays)) {
      packetDays[r.id] = r.packet_days;
      plotRows.push({ id: r.id, plotCode: r.plot_code });
    }
    if (r.observation_id !== null) {
      stored.push({ id: r.observation_id, plotId: r.id, traitId: r.trait_id!, occasion: r.occasion!, valueNumber: r.value_number === null ? null : Number(r.value_number), valueDate: r.value_date, valueText: r.value_text, missingReason: r.missing_reason });
    }
  }
  return { plots: plotRows, stored, packetDays };
}

const PLOTS_FOR_SAVE = {
  select: fixedSql(sql`SELECT ${plots.id} AS id, ${plots.plotCode} AS plot_code, ${seedLots.packetDaysToMaturity} AS packet_days,
      ${observations.id} AS observation_id, ${observations.traitId} AS trait_id, ${observations.occasion} AS occasion,
      ${observations.valueNumber} AS value_number, ${observations.valueDate} AS value_date, ${observations.valueText} AS value_text, ${observations.missingReason} AS missing_reason
    FROM ${plots}
      JOIN ${trialEntries} ON ${trialEntries.id} = ${plots.entryId}
      LEFT JOIN ${seedLots} ON ${seedLots.id} = ${trialEntries.seedLotId}
      LEFT JOIN ${observations} ON ${observations.plotId} = ${plots.id}
    WHERE ${plots.enrolmentId} = `),
  andPlotIn: fixedSql(sql` AND ${plots.id} IN `),
};

/** A row of listPlotsForSave's read, as the driver returns it: a plot, and one of its stored values or none. */
interface PlotForSaveRow {
  id: number;
  plot_code: string;
  packet_days: number | null;
  observation_id: number | null;
  trait_id: number | null;
  occasion: number | null;
  /** DECIMAL: a number (the pool reads decimals as numbers), or its text from a driver that does not */
  value_number: string | number | null;
  /** DATE, as text (the pool reads dates as strings) */
  value_date: string | null;
  value_text: string | null;
  missing_reason: MissingReason | null;
}

/** The stored answer to a save the viewer sent earlier with this id (ids are scoped to their user), or null. */
export async function getClientSave(ex: Executor, userId: number, clientSaveId: string) {
  const [row] = await ex
    .select({ trialId: clientSaves.trialId, siteId: clientSaves.siteId, answer: clientSaves.answer })
    .from(clientSaves)
    .where(and(eq(clientSaves.userId, userId), eq(clientSaves.clientSaveId, clientSaveId)));
  return row ?? null;
}

/** Review state of an enrolment's data set, or null before anything was recorded. */
export async function getSubmissionRow(ex: Executor, enrolmentId: number) {
  const [row] = await ex
    .select({ id: submissions.id, status: submissions.status, submittedAt: submissions.submittedAt, reviewedAt: submissions.reviewedAt, reviewComment: submissions.reviewComment })
    .from(submissions)
    .where(eq(submissions.enrolmentId, enrolmentId));
  return row ?? null;
}

/** A site's open review comments, oldest first. */
export async function listOpenComments(enrolmentId: number) {
  return db
    .select({ id: reviewComments.id, plotId: reviewComments.plotId, observationId: reviewComments.observationId, body: reviewComments.body, author: users.name, createdAt: reviewComments.createdAt })
    .from(reviewComments)
    .innerJoin(submissions, eq(submissions.id, reviewComments.submissionId))
    .leftJoin(users, eq(users.id, reviewComments.authorId))
    .where(and(eq(submissions.enrolmentId, enrolmentId), isNull(reviewComments.resolvedAt)))
    .orderBy(asc(reviewComments.id));
}

/**
 * The stored rows behind one site's recording sheet: the enrolment, its traits, plots in layout order,
 * recorded values, the review state and open comments. Null when not the viewer's.
 */
export async function getRecordingRows(viewer: Viewer, p: { trialId: number; siteId: number }) {
  const enrolment = await getRecordableEnrolment(db, viewer, p);
  if (!enrolment) return null;
  const [traitRows, plotRows, stored, submission, comments] = await Promise.all([
    listTrialTraits(db, enrolment.trialId),
    listEnrolmentPlots(db, enrolment.enrolmentId),
    listEnrolmentObservations(db, enrolment.enrolmentId),
    getSubmissionRow(db, enrolment.enrolmentId),
    listOpenComments(enrolment.enrolmentId),
  ]);
  return { enrolment, traits: traitRows, plots: plotRows, observations: stored, submission, comments };
}
export type RecordingRows = NonNullable<Awaited<ReturnType<typeof getRecordingRows>>>;

/** The sites the viewer records for in trials that are taking data, in trial and site order. */
export async function listRecordableSiteRows(viewer: Viewer) {
  return db
    .select({
      trialId: trials.id,
      trialCode: trials.code,
      trialTitle: trials.title,
      trialStatus: trials.status,
      siteId: sites.id,
      siteName: sites.name,
      sownOn: enrolments.sownOn,
      enrolmentId: enrolments.id,
      submissionStatus: submissions.status,
    })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .leftJoin(submissions, eq(submissions.enrolmentId, enrolments.id))
    .where(and(recordScope(viewer), inArray(trials.status, ["open", "collecting", "analysing"]), sql`${enrolments.randomisedAt} IS NOT NULL`))
    .orderBy(asc(trials.code), asc(sites.name));
}

/** Resolves a plot id to its trial and site if the viewer may record for it (QR labels open plot pages). */
export async function getPlotRecordTarget(viewer: Viewer, plotId: number) {
  const [row] = await db
    .select({ plotId: plots.id, trialId: plots.trialId, siteId: plots.siteId })
    .from(plots)
    .innerJoin(enrolments, eq(enrolments.id, plots.enrolmentId))
    .innerJoin(trials, eq(trials.id, plots.trialId))
    .where(and(eq(plots.id, plotId), or(recordScope(viewer))));
  return row ?? null;
}
