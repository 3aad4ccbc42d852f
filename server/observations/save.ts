import "server-only";
import { db, type Tx } from "@/db/index";
import { getRecordableEnrolment, getSubmissionRow, listEnrolmentObservations, listEnrolmentPlots, listPlotPacketDays, type RecordableEnrolment } from "@/db/queries/observations";
import { insertDraftSubmission, insertObservationAudits, insertObservationHistory, insertObservations, updateObservation, type AuditEntry } from "@/db/mutations/observations";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { crossCheckPlot, displayEntry, isBlank, parseEntry, sameValue, type CellValue, type TextNumberCommas } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";
import type { EntryColumn } from "@/lib/domain/observations/columns";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { datesToCheck, type DateCheckKind } from "@/lib/domain/observations/date-order";
import { todayIso } from "@/lib/domain/schedule";
import { keyObservations, listTrialColumns } from "./sheet";

/**
 * One value to record: the plot by id (forms) or by its label code (spreadsheets). `row` names a spreadsheet
 * row. `missing` says why there is no value (forms); a spreadsheet cell says it in `raw` ("missing: died").
 */
export interface CellInput {
  plotId?: number;
  plotCode?: string;
  key: string;
  raw: unknown;
  missing?: MissingReason | null;
  row?: number;
}

export interface Problem {
  row?: number;
  column?: string;
  plotId?: number;
  plotCode?: string;
  key?: string;
  message: string;
}

/** A value that saves but is worth a second look (dates out of order, far from the packet). */
export interface Warning extends Problem {
  plotId: number;
  plotCode: string;
  key: string;
  kind: DateCheckKind;
}

export type ChangeKind = "new" | "changed" | "unchanged";

export interface PlannedChange {
  plotId: number;
  plotCode: string;
  column: EntryColumn;
  kind: ChangeKind;
  oldValue: CellValue | null;
  newValue: CellValue | null;
  oldReason: MissingReason | null;
  newReason: MissingReason | null;
  observationId: number | null;
  row?: number;
}

export interface ObservationPlan {
  enrolment: RecordableEnrolment;
  problems: Problem[];
  warnings: Warning[];
  changes: PlannedChange[];
  counts: Record<ChangeKind, number>;
}

const NO_VALUE: CellValue = { valueNumber: null, valueDate: null, valueText: null };

/** Whether the viewer may still change this site's values (sent or accepted data is locked for growers). */
function assertEditable(viewer: Viewer, enrolment: RecordableEnrolment, status: string | null) {
  if (enrolment.trialStatus === "published" || enrolment.trialStatus === "archived") {
    throw new AppError("conflict", "This trial's results are published, so its values can no longer change.");
  }
  if (viewer.role !== "cooperator") return;
  if (enrolment.trialStatus === "draft") throw new AppError("conflict", "This trial is not taking data yet.");
  if (status === "submitted") throw new AppError("conflict", "You have sent this site's data for review, so it is locked until your coordinator accepts or returns it.");
  if (status === "accepted") throw new AppError("conflict", "Your coordinator has accepted this site's data, so it is locked. Ask them if something needs correcting.");
}

/**
 * Checks every value against its trait, the plot layout and the other values of the same plot, and works
 * out what would be new, changed or unchanged. Writes nothing; used for previews and inside the save.
 */
export async function planSiteObservations(
  ex: Tx | typeof db,
  viewer: Viewer,
  input: { trialId: number; siteId: number; cells: CellInput[]; textNumberCommas?: TextNumberCommas },
  opts: { lock?: boolean; today?: string } = {},
): Promise<ObservationPlan> {
  const enrolment = await getRecordableEnrolment(ex, viewer, input, opts.lock);
  // Unknown and foreign sites look the same, so ids cannot be probed.
  if (!enrolment) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
  const sub = await getSubmissionRow(ex, enrolment.enrolmentId);
  assertEditable(viewer, enrolment, sub?.status ?? null);

  // Every check is per plot, so a save that names its plots by id (the phone form) reads only those plots;
  // a sheet names plots by code and reads the site's plots to find them.
  const onlyPlots = input.cells.length > 0 && input.cells.every((c) => c.plotId !== undefined) ? [...new Set(input.cells.map((c) => c.plotId!))] : undefined;
  const [columns, plotRows, storedRows, packetDays] = await Promise.all([
    listTrialColumns(ex, enrolment.trialId),
    listEnrolmentPlots(ex, enrolment.enrolmentId, onlyPlots),
    listEnrolmentObservations(ex, enrolment.enrolmentId, onlyPlots),
    listPlotPacketDays(ex, enrolment.enrolmentId, onlyPlots),
  ]);
  const stored = keyObservations(storedRows, columns);
  const byId = new Map(plotRows.map((p) => [p.id, p]));
  const byCode = new Map(plotRows.map((p) => [p.plotCode.toUpperCase(), p]));
  const colByKey = new Map(columns.map((c) => [c.key, c]));
  const existing = new Map(stored.map((o) => [`${o.plotId}:${o.key}`, o]));
  const site = { sownOn: enrolment.sownOn, transplantedOn: enrolment.transplantedOn };
  // Messages in the viewer's language (a grower reads them on the form and in the upload preview).
  const t = translatorFor(viewer.locale);
  const ctx = { ...site, today: opts.today ?? todayIso(), textNumberCommas: input.textNumberCommas, t };

  const problems: Problem[] = [];
  const accepted: { plot: (typeof plotRows)[number]; column: EntryColumn; value: CellValue | null; reason: MissingReason | null; row?: number }[] = [];
  const seen = new Map<string, number | undefined>();
  for (const cell of input.cells) {
    const plot = cell.plotId !== undefined ? byId.get(cell.plotId) : cell.plotCode !== undefined ? byCode.get(cell.plotCode.trim().toUpperCase()) : undefined;
    const column = colByKey.get(cell.key);
    const where = { row: cell.row, plotId: cell.plotId, plotCode: cell.plotCode, key: cell.key, column: column?.heading };
    if (!plot) {
      problems.push({ ...where, message: cell.plotCode !== undefined ? t("upload.unknownPlot", { plot: cell.plotCode }) : t("upload.unknownPlotId") });
      continue;
    }
    if (!column) {
      problems.push({ ...where, message: t("upload.notRecorded") });
      continue;
    }
    const slot = `${plot.id}:${column.key}`;
    if (seen.has(slot)) {
      problems.push({ ...where, message: t("upload.plotTwice", { plot: plot.plotCode, row: seen.get(slot) ? String(seen.get(slot)) : "none" }) });
      continue;
    }
    seen.set(slot, cell.row);
    const parsed = parseEntry(column, cell.raw, cell.missing, ctx);
    if (!parsed.ok) problems.push({ ...where, plotId: plot.id, plotCode: plot.plotCode, message: parsed.message });
    else accepted.push({ plot, column, value: parsed.value, reason: parsed.reason, row: cell.row });
  }

  // Cross-checks see the plot as it would be after the save: stored values overlaid with the new ones.
  const isUnchanged = (a: (typeof accepted)[number]) => {
    const old = existing.get(`${a.plot.id}:${a.column.key}`) ?? null;
    const oldValue = old && !isBlank(old) ? old : null;
    return sameValue(oldValue, a.value && !isBlank(a.value) ? a.value : null) && (old?.missingReason ?? null) === a.reason;
  };
  const warnings: Warning[] = [];
  const byPlot = new Map<number, typeof accepted>();
  for (const a of accepted) byPlot.set(a.plot.id, [...(byPlot.get(a.plot.id) ?? []), a]);
  for (const [plotId, items] of byPlot) {
    const merged = new Map<string, CellValue | null>();
    for (const o of stored) if (o.plotId === plotId) merged.set(o.key, o);
    for (const a of items) merged.set(a.column.key, a.value);
    for (const issue of crossCheckPlot(columns, merged, new Set(items.map((a) => a.column.key)), t)) {
      const a = items.find((x) => x.column.key === issue.key)!;
      problems.push({ row: a.row, plotId, plotCode: a.plot.plotCode, key: issue.key, column: a.column.heading, message: issue.message });
    }
    // Dates out of order warn on a value this save changes that takes part (the harvest date when both
    // change); a sheet sent again with the same values repeats nothing already under Values to check.
    const audience = viewer.role === "cooperator" ? "grower" : "staff";
    const changing = items.filter((a) => !isUnchanged(a));
    for (const w of datesToCheck({ columns, value: (key) => merged.get(key), site, packetDays: packetDays[plotId] ?? null, audience })) {
      const a = changing.find((x) => x.column.key === w.key) ?? changing.find((x) => w.keys.includes(x.column.key));
      if (a) warnings.push({ row: a.row, plotId, plotCode: a.plot.plotCode, key: a.column.key, column: a.column.heading, kind: w.kind, message: w.message });
    }
  }

  const changes: PlannedChange[] = [];
  const counts: Record<ChangeKind, number> = { new: 0, changed: 0, unchanged: 0 };
  for (const a of accepted) {
    const old = existing.get(`${a.plot.id}:${a.column.key}`) ?? null;
    const oldValue = old && !isBlank(old) ? { valueNumber: old.valueNumber, valueDate: old.valueDate, valueText: old.valueText } : null;
    const newValue = a.value && !isBlank(a.value) ? a.value : null;
    const oldReason = old?.missingReason ?? null;
    const kind: ChangeKind = sameValue(oldValue, newValue) && oldReason === a.reason ? "unchanged" : oldValue === null && oldReason === null ? "new" : "changed";
    counts[kind] += 1;
    changes.push({ plotId: a.plot.id, plotCode: a.plot.plotCode, column: a.column, kind, oldValue, newValue, oldReason, newReason: a.reason, observationId: old?.id ?? null, row: a.row });
  }
  problems.sort((x, y) => (x.row ?? 0) - (y.row ?? 0));
  warnings.sort((x, y) => (x.row ?? 0) - (y.row ?? 0));
  return { enrolment, problems, warnings, changes, counts };
}

/**
 * Records values for one site in one transaction: any problem means nothing is written; warnings do not
 * stop the save and are returned with it. Earlier values go
 * to observation_history and every new or changed value gets an audit entry with old and new value.
 */
export async function saveSiteObservations(
  viewer: Viewer,
  input: { trialId: number; siteId: number; cells: CellInput[]; source: "form" | "upload"; textNumberCommas?: TextNumberCommas },
  opts: { today?: string } = {},
) {
  const observedOn = opts.today ?? todayIso();
  return db.transaction(async (tx) => {
    // The enrolment row lock serialises saves for one site, so two phones never insert the same value twice.
    const plan = await planSiteObservations(tx, viewer, input, { lock: true, today: opts.today });
    if (plan.problems.length > 0) {
      const fieldErrors: Record<string, string[]> = {};
      for (const p of plan.problems) (fieldErrors[`${p.plotId ?? p.plotCode ?? "row" + p.row}:${p.key ?? ""}`] ??= []).push(p.message);
      throw new AppError("bad_request", plan.problems.length === 1 ? plan.problems[0]!.message : translatorFor(viewer.locale)("upload.valuesNeedFixing", { count: String(plan.problems.length) }), fieldErrors);
    }
    const { enrolment } = plan;
    const todo = plan.changes.filter((c) => c.kind !== "unchanged");
    const auditRow = (c: PlannedChange, observationId: number): AuditEntry => ({
      actorId: viewer.id,
      action: c.kind === "new" ? "observation.record" : "observation.change",
      entity: "observation",
      entityId: String(observationId),
      trialId: enrolment.trialId,
      oldValue: c.oldValue || c.oldReason ? { plot: c.plotCode, column: c.column.key, value: displayEntry(c.column, c.oldValue, c.oldReason) } : null,
      newValue: { plot: c.plotCode, column: c.column.key, value: displayEntry(c.column, c.newValue, c.newReason), source: input.source },
    });

    const fresh = todo.filter((c) => c.observationId === null);
    const ids = await insertObservations(
      tx,
      fresh.map((c) => ({ plotId: c.plotId, traitId: c.column.traitId, occasion: c.column.occasion, observedOn, ...(c.newValue ?? NO_VALUE), missingReason: c.newReason, recordedById: viewer.id })),
    );
    const audits = fresh.map((c, i) => auditRow(c, ids[i]!));
    const updates = todo.filter((c) => c.observationId !== null);
    await insertObservationHistory(
      tx,
      updates.map((c) => ({ observationId: c.observationId!, valueNumber: c.oldValue?.valueNumber ?? null, valueDate: c.oldValue?.valueDate ?? null, valueText: c.oldValue?.valueText ?? null, changedById: viewer.id })),
    );
    for (const c of updates) {
      // The earlier reason stays in the audit entry.
      await updateObservation(tx, { id: c.observationId!, value: c.newValue ?? NO_VALUE, missingReason: c.newReason, recordedById: viewer.id, observedOn });
      audits.push(auditRow(c, c.observationId!));
    }
    await insertObservationAudits(tx, audits);

    // The first value recorded opens the site's data set as a draft for review.
    if (todo.length > 0) await insertDraftSubmission(tx, enrolment.enrolmentId);
    return { counts: plan.counts, saved: todo.length, warnings: plan.warnings };
  });
}
