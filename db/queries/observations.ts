import "server-only";
import { and, asc, eq, inArray, isNull, or, sql, type SQL } from "drizzle-orm";
import { db, type Tx } from "../index";
import { enrolments, observations, plots, reviewComments, sites, submissions, trialEntries, trialTraits, traits, trials, users } from "../schema";
import { cooperatorEnrolmentScope, staffTrialScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { entryColumns, type EntryColumn } from "@/lib/domain/observations/columns";
import type { CellValue } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";
import { scheduleForSite, todayIso } from "@/lib/domain/schedule";

/** Enrolments the viewer may record for: a cooperator's own sites, or the trials a staff member manages. */
export function recordScope(viewer: Viewer): SQL {
  if (viewer.role === "cooperator") return cooperatorEnrolmentScope(viewer);
  return staffTrialScope(viewer);
}

type Executor = Tx | typeof db;

/** One enrolment (site in a trial) the viewer may record for, optionally row-locked; null otherwise. */
export async function getRecordableEnrolment(ex: Executor, viewer: Viewer, p: { trialId: number; siteId: number }, lock = false) {
  const q = ex
    .select({
      enrolmentId: enrolments.id,
      trialId: trials.id,
      trialCode: trials.code,
      trialTitle: trials.title,
      trialStatus: trials.status,
      programId: trials.programId,
      siteId: sites.id,
      siteName: sites.name,
      sownOn: enrolments.sownOn,
      cooperatorId: enrolments.cooperatorId,
    })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .where(and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId), recordScope(viewer)));
  const [row] = lock ? await q.for("update") : await q;
  return row ?? null;
}
export type RecordableEnrolment = NonNullable<Awaited<ReturnType<typeof getRecordableEnrolment>>>;

/** The columns recorded in a trial, in the trial's trait order. */
export async function listTrialColumns(ex: Executor, trialId: number): Promise<EntryColumn[]> {
  const rows = await ex
    .select({
      id: traits.id,
      code: traits.code,
      name: traits.name,
      unit: traits.unit,
      valueType: traits.valueType,
      minValue: traits.minValue,
      maxValue: traits.maxValue,
      dueDaysAfterSowing: traits.dueDaysAfterSowing,
      dueNote: traits.dueNote,
    })
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .where(eq(trialTraits.trialId, trialId))
    .orderBy(asc(trialTraits.sortOrder), asc(trialTraits.id));
  return entryColumns(rows);
}

/** Plots of an enrolment in layout order (block, then position), with blind codes only. */
export async function listEnrolmentPlots(ex: Executor, enrolmentId: number) {
  return ex
    .select({ id: plots.id, plotCode: plots.plotCode, block: plots.block, position: plots.position, tray: plots.tray, traySlot: plots.traySlot, blindCode: trialEntries.blindCode })
    .from(plots)
    .innerJoin(trialEntries, eq(trialEntries.id, plots.entryId))
    .where(eq(plots.enrolmentId, enrolmentId))
    .orderBy(asc(plots.block), asc(plots.position));
}
export type EnrolmentPlot = Awaited<ReturnType<typeof listEnrolmentPlots>>[number];

export interface StoredObservation extends CellValue {
  id: number;
  plotId: number;
  key: string;
  missingReason: MissingReason | null;
}

/** Recorded values of an enrolment keyed by plot and column. */
export async function listEnrolmentObservations(ex: Executor, enrolmentId: number, columns: EntryColumn[]): Promise<StoredObservation[]> {
  const rows = await ex
    .select({ id: observations.id, plotId: observations.plotId, traitId: observations.traitId, occasion: observations.occasion, valueNumber: observations.valueNumber, valueDate: observations.valueDate, valueText: observations.valueText, missingReason: observations.missingReason })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(eq(plots.enrolmentId, enrolmentId));
  const keyOf = new Map(columns.map((c) => [`${c.traitId}:${c.occasion}`, c.key]));
  const out: StoredObservation[] = [];
  for (const r of rows) {
    const key = keyOf.get(`${r.traitId}:${r.occasion}`);
    if (key) out.push({ id: r.id, plotId: r.plotId, key, valueNumber: r.valueNumber === null ? null : Number(r.valueNumber), valueDate: r.valueDate, valueText: r.valueText, missingReason: r.missingReason });
  }
  return out;
}

/**
 * Everything the data-entry page needs for one site in one trial: plots in layout order, columns,
 * recorded values, what is due or late, the review state and open comments. Null when not the viewer's.
 */
export async function getRecordingSheet(viewer: Viewer, p: { trialId: number; siteId: number }, today: string = todayIso()) {
  const enrolment = await getRecordableEnrolment(db, viewer, p);
  if (!enrolment) return null;
  const [columns, plotRows] = await Promise.all([listTrialColumns(db, enrolment.trialId), listEnrolmentPlots(db, enrolment.enrolmentId)]);
  const [stored, [submission], comments] = await Promise.all([
    listEnrolmentObservations(db, enrolment.enrolmentId, columns),
    db
      .select({ id: submissions.id, status: submissions.status, submittedAt: submissions.submittedAt, reviewedAt: submissions.reviewedAt, reviewComment: submissions.reviewComment })
      .from(submissions)
      .where(eq(submissions.enrolmentId, enrolment.enrolmentId)),
    db
      .select({ id: reviewComments.id, plotId: reviewComments.plotId, observationId: reviewComments.observationId, body: reviewComments.body, author: users.name, createdAt: reviewComments.createdAt })
      .from(reviewComments)
      .innerJoin(submissions, eq(submissions.id, reviewComments.submissionId))
      .leftJoin(users, eq(users.id, reviewComments.authorId))
      .where(and(eq(submissions.enrolmentId, enrolment.enrolmentId), isNull(reviewComments.resolvedAt)))
      .orderBy(asc(reviewComments.id)),
  ]);
  const values: Record<number, Record<string, CellValue>> = {};
  const missing: Record<number, Record<string, MissingReason>> = {};
  const recorded = new Map<string, number>();
  for (const o of stored) {
    (values[o.plotId] ??= {})[o.key] = { valueNumber: o.valueNumber, valueDate: o.valueDate, valueText: o.valueText };
    if (o.missingReason) (missing[o.plotId] ??= {})[o.key] = o.missingReason;
    const col = columns.find((c) => c.key === o.key)!;
    // A plot marked missing with a reason is done for that count, just like one with a value.
    if (o.valueNumber !== null || o.valueDate !== null || o.valueText !== null || o.missingReason) recorded.set(`${col.traitId}:${col.occasion}`, (recorded.get(`${col.traitId}:${col.occasion}`) ?? 0) + 1);
  }
  const due = scheduleForSite({
    sownOn: enrolment.sownOn,
    plotCount: plotRows.length,
    traits: columns.filter((c) => c.dueDay !== null).reduce<{ id: number; name: string; dueDaysAfterSowing: number[] }[]>((acc, c) => {
      const t = acc.find((x) => x.id === c.traitId);
      if (t) t.dueDaysAfterSowing.push(c.occasion);
      else acc.push({ id: c.traitId, name: c.name.replace(/ day \d+$/, ""), dueDaysAfterSowing: [c.occasion] });
      return acc;
    }, []),
    recorded,
    today,
  });
  const observationIds: Record<string, number> = {};
  for (const o of stored) observationIds[`${o.plotId}:${o.key}`] = o.id;
  return {
    enrolment: { ...enrolment, programId: undefined, cooperatorId: undefined },
    columns,
    plots: plotRows,
    values,
    missing,
    observationIds,
    due,
    submission: submission ?? null,
    comments,
    today,
  };
}
export type RecordingSheet = NonNullable<Awaited<ReturnType<typeof getRecordingSheet>>>;

/** The sites the viewer records for in trials that are taking data, with their due and late counts. */
export async function listRecordableSites(viewer: Viewer, today: string = todayIso()) {
  const rows = await db
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
  const out = [];
  for (const r of rows) {
    const sheet = await getRecordingSheet(viewer, { trialId: r.trialId, siteId: r.siteId }, today);
    const due = sheet?.due ?? [];
    out.push({
      ...r,
      plotCount: sheet?.plots.length ?? 0,
      dueToday: due.filter((d) => d.status === "due_today"),
      late: due.filter((d) => d.status === "late"),
      openComments: sheet?.comments.length ?? 0,
    });
  }
  return out;
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
