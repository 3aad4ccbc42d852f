import "server-only";
import { db, type Tx } from "@/db/index";
import { getClientSave, getSaveTarget, listPlotsForSave, type SaveSite } from "@/db/queries/observations";
import { insertClientSave, insertDraftSubmission, insertObservationAudits, insertObservationHistory, insertObservations, updateObservations, type AuditEntry } from "@/db/mutations/observations";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { crossCheckPlot, displayEntry, displayValue, isBlank, parseEntry, sameValue, type CellValue, type TextNumberCommas } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";
import { entryColumns, type EntryColumn } from "@/lib/domain/observations/columns";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { datesToCheck, type DateCheckKind } from "@/lib/domain/observations/date-order";
import { todayIso } from "@/lib/domain/schedule";
import { keyObservations } from "./sheet";

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
  /** What the sender last knew as saved in this slot (forms); a slot changed since then is a conflict, not an overwrite. */
  knownSaved?: { raw: string | null; missing: MissingReason | null };
}

/** A slot someone else changed since the sender last saw it: both values, so the grower can choose. */
export interface Conflict {
  plotId: number;
  plotCode: string;
  key: string;
  column: string;
  /** What the server holds now, as the form shows it ("" when empty). */
  saved: string;
  savedReason: MissingReason | null;
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
  enrolment: SaveSite;
  problems: Problem[];
  conflicts: Conflict[];
  warnings: Warning[];
  changes: PlannedChange[];
  counts: Record<ChangeKind, number>;
}

const NO_VALUE: CellValue = { valueNumber: null, valueDate: null, valueText: null };

/** Whether the viewer may still change this site's values (sent or accepted data is locked for growers). */
function assertEditable(viewer: Viewer, enrolment: SaveSite, status: string | null) {
  const t = translatorFor(viewer.locale);
  if (enrolment.trialStatus === "published" || enrolment.trialStatus === "archived") throw new AppError("conflict", t("forms.publishedLocked"));
  if (viewer.role !== "cooperator") return;
  if (enrolment.trialStatus === "draft") throw new AppError("conflict", t("forms.notTakingData"));
  if (status === "submitted") throw new AppError("conflict", t("forms.submittedLocked"));
  if (status === "accepted") throw new AppError("conflict", t("forms.acceptedLocked"));
}

/** The site a save writes to and the trial's columns, read together (and locked, inside a save). */
interface SaveTarget {
  enrolment: SaveSite;
  columns: EntryColumn[];
}

async function readSaveTarget(ex: Tx | typeof db, viewer: Viewer, p: { trialId: number; siteId: number }, lock: boolean): Promise<SaveTarget | null> {
  const found = await getSaveTarget(ex, viewer, p, lock);
  return found && { enrolment: found.site, columns: entryColumns(found.traits) };
}

function assertRecordable(viewer: Viewer, target: SaveTarget | null): asserts target is SaveTarget {
  // Unknown and foreign sites look the same, so ids cannot be probed.
  if (!target) throw new AppError("not_found", translatorFor(viewer.locale)("forms.notYours"));
  assertEditable(viewer, target.enrolment, target.enrolment.submissionStatus);
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
  const target = await readSaveTarget(ex, viewer, input, opts.lock ?? false);
  assertRecordable(viewer, target);
  return planForTarget(ex, viewer, target, input, opts);
}

async function planForTarget(
  ex: Tx | typeof db,
  viewer: Viewer,
  { enrolment, columns }: SaveTarget,
  input: { cells: CellInput[]; textNumberCommas?: TextNumberCommas },
  opts: { today?: string },
): Promise<ObservationPlan> {
  // Every check is per plot, so a save that names its plots by id (the phone form) reads only those plots;
  // a sheet names plots by code and reads the site's plots to find them.
  const onlyPlots = input.cells.length > 0 && input.cells.every((c) => c.plotId !== undefined) ? [...new Set(input.cells.map((c) => c.plotId!))] : undefined;
  const { plots: plotRows, stored: storedRows, packetDays } = await listPlotsForSave(ex, enrolment.enrolmentId, onlyPlots);
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
  const accepted: { plot: (typeof plotRows)[number]; column: EntryColumn; value: CellValue | null; reason: MissingReason | null; row?: number; knownSaved?: CellInput["knownSaved"] }[] = [];
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
    else accepted.push({ plot, column, value: parsed.value, reason: parsed.reason, row: cell.row, knownSaved: cell.knownSaved });
  }

  // Cross-checks see the plot as it would be after the save: stored values overlaid with the new ones.
  const isUnchanged = (a: (typeof accepted)[number]) => {
    const old = existing.get(`${a.plot.id}:${a.column.key}`) ?? null;
    const oldValue = old && !isBlank(old) ? old : null;
    return sameValue(oldValue, a.value && !isBlank(a.value) ? a.value : null) && (old?.missingReason ?? null) === a.reason;
  };
  // The row-by-row stale check: a slot whose stored value is no longer what the sender last saw, and that this
  // save would change, is someone else's newer value (a coordinator's correction); it is never overwritten unseen.
  const storedMatches = (a: (typeof accepted)[number]) => {
    if (!a.knownSaved) return true;
    const old = existing.get(`${a.plot.id}:${a.column.key}`) ?? null;
    const oldValue = old && !isBlank(old) ? old : null;
    const oldReason = old?.missingReason ?? null;
    const known = parseEntry(a.column, a.knownSaved.raw, a.knownSaved.missing, ctx);
    if (known.ok) return sameValue(oldValue, known.value && !isBlank(known.value) ? known.value : null) && oldReason === known.reason;
    return displayValue(a.column, oldValue) === (a.knownSaved.raw ?? "") && oldReason === a.knownSaved.missing;
  };
  const conflicts: Conflict[] = [];
  for (const a of accepted) {
    if (storedMatches(a) || isUnchanged(a)) continue;
    const old = existing.get(`${a.plot.id}:${a.column.key}`) ?? null;
    conflicts.push({ plotId: a.plot.id, plotCode: a.plot.plotCode, key: a.column.key, column: a.column.heading, saved: displayValue(a.column, old && !isBlank(old) ? old : null), savedReason: old?.missingReason ?? null });
  }
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
    for (const w of datesToCheck({ columns, value: (key) => merged.get(key), site, packetDays: packetDays[plotId] ?? null, audience, t })) {
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
  return { enrolment, problems, conflicts, warnings, changes, counts };
}

/**
 * Records values for one site in one transaction: any problem means nothing is written; warnings do not
 * stop the save and are returned with it. Earlier values go
 * to observation_history and every new or changed value gets an audit entry with old and new value.
 */
export async function saveSiteObservations(
  viewer: Viewer,
  input: { trialId: number; siteId: number; cells: CellInput[]; source: "form" | "upload"; textNumberCommas?: TextNumberCommas; clientSaveId?: string },
  opts: { today?: string } = {},
): Promise<SaveAnswer> {
  try {
    return await saveOnce(viewer, input, opts);
  } catch (e) {
    // The same save sent twice at once: the first committed its answer, the second lost on the unique key.
    if (input.clientSaveId && isDuplicateKey(e)) {
      const earlier = await getClientSave(db, viewer.id, input.clientSaveId);
      if (earlier) return earlierAnswer(earlier, input);
    }
    throw e;
  }
}

export interface SaveAnswer {
  counts: Record<ChangeKind, number>;
  saved: number;
  warnings: Warning[];
}

/** Nothing was written: these slots changed on the server since the sender last saw them. */
export class StaleValuesError extends AppError {
  constructor(public readonly conflicts: Conflict[]) {
    super("conflict", conflicts.length === 1 ? "This value was changed by someone else since you last saw it." : `${conflicts.length} values were changed by someone else since you last saw them.`);
  }
}

function earlierAnswer(earlier: { trialId: number; siteId: number; answer: string }, input: { trialId: number; siteId: number }): SaveAnswer {
  if (earlier.trialId !== input.trialId || earlier.siteId !== input.siteId) throw new AppError("bad_request", "This save was already sent for another site.");
  return JSON.parse(earlier.answer) as SaveAnswer;
}

function isDuplicateKey(e: unknown, depth = 0): boolean {
  if (!e || typeof e !== "object" || depth > 5) return false;
  if ((e as { code?: unknown }).code === "ER_DUP_ENTRY") return true;
  return isDuplicateKey((e as { cause?: unknown }).cause, depth + 1);
}

async function saveOnce(viewer: Viewer, input: Parameters<typeof saveSiteObservations>[1], opts: { today?: string }): Promise<SaveAnswer> {
  const observedOn = opts.today ?? todayIso();
  return db.transaction(async (tx) => {
    // The enrolment row lock serialises saves for one site, so two phones never insert the same value twice.
    // The site and the trial's columns are read once, after the locks.
    const target = await readSaveTarget(tx, viewer, input, true);
    // A save the phone sent before (the answer was lost on the way) answers what it answered then, even if the
    // site has been sent for review since. The site's lock comes first, so this read (and the plan's) sees any
    // save of the same id that committed meanwhile.
    if (input.clientSaveId) {
      const earlier = await getClientSave(tx, viewer.id, input.clientSaveId);
      if (earlier) return earlierAnswer(earlier, input);
    }
    assertRecordable(viewer, target);
    const plan = await planForTarget(tx, viewer, target, input, { today: opts.today });
    if (plan.problems.length > 0) {
      const fieldErrors: Record<string, string[]> = {};
      for (const p of plan.problems) (fieldErrors[`${p.plotId ?? p.plotCode ?? "row" + p.row}:${p.key ?? ""}`] ??= []).push(p.message);
      throw new AppError("bad_request", plan.problems.length === 1 ? plan.problems[0]!.message : translatorFor(viewer.locale)("upload.valuesNeedFixing", { count: String(plan.problems.length) }), fieldErrors);
    }
    if (plan.conflicts.length > 0) throw new StaleValuesError(plan.conflicts);
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
    // The earlier reason stays in the audit entry.
    await updateObservations(
      tx,
      updates.map((c) => ({ id: c.observationId!, plotId: c.plotId, traitId: c.column.traitId, occasion: c.column.occasion, observedOn, ...(c.newValue ?? NO_VALUE), missingReason: c.newReason, recordedById: viewer.id })),
    );
    for (const c of updates) audits.push(auditRow(c, c.observationId!));
    await insertObservationAudits(tx, audits);

    // The first value recorded opens the site's data set as a draft for review.
    if (todo.length > 0 && enrolment.submissionStatus === null) await insertDraftSubmission(tx, enrolment.enrolmentId);
    const answer: SaveAnswer = { counts: plan.counts, saved: todo.length, warnings: plan.warnings };
    if (input.clientSaveId) await insertClientSave(tx, { userId: viewer.id, clientSaveId: input.clientSaveId, trialId: input.trialId, siteId: input.siteId, answer: JSON.stringify(answer) });
    return answer;
  });
}
