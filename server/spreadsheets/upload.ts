import "server-only";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { getRecordingSheet, type RecordingSheet } from "@/server/observations/sheet";
import { planSiteObservations, saveSiteObservations, type CellInput } from "@/server/observations/save";
import { db } from "@/db/index";
import { displayEntry } from "@/lib/domain/observations/values";
import { addDays, todayIso } from "@/lib/domain/schedule";
import { listWords, readUpload, type ReadResult, type SheetRow } from "@/lib/domain/spreadsheets/read";
import { inspectUpload, UploadRefused } from "@/lib/domain/spreadsheets/safety";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

export interface UploadProblem {
  row: number | null;
  column: string | null;
  message: string;
}

export interface UploadTarget {
  trialId: number;
  siteId: number;
  bytes: Uint8Array;
  fileName: string;
}

const MAX_PREVIEW_CHANGES = 500;

/** Where a problem is, in the grower's terms: "Row 5, column E (Quality [1-9])". */
function place(t: Translator, row: number | undefined, letter: string | undefined, heading: string | undefined) {
  if (row === undefined) return null;
  if (!letter) return heading ?? null;
  return heading ? t("upload.columnHeading", { letter, heading }) : t("upload.column", { letter });
}

/** A cell's value as text, for telling whether two rows of the same plot agree. */
function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  return String(v).trim();
}

const shown = (t: Translator, v: string) => (v === "" ? t("upload.empty") : `"${v.length > 40 ? `${v.slice(0, 40)}…` : v}"`);

/** Says which columns two rows of the same plot disagree in, so the grower knows which row to keep. */
function duplicateMessage(t: Translator, first: SheetRow, again: SheetRow, read: ReadResult, sheet: RecordingSheet): string {
  const compared: [string, string, string, string][] = [
    [read.letters["#block"]!, "Block", first.block, again.block],
    [read.letters["#code"]!, "Code", first.code, again.code],
    ...sheet.columns.map((c) => [read.letters[c.key]!, c.heading, cellText(first.values[c.key]), cellText(again.values[c.key])] as [string, string, string, string]),
  ];
  const differ = compared.filter(([, , a, b]) => a !== b);
  const rows = { plot: again.plotCode, first: String(first.row), again: String(again.row) };
  if (differ.length === 0) return t("upload.duplicateSame", rows);
  const listed = differ.slice(0, 5).map(([letter, heading, a, b]) => t("upload.duplicateColumn", { ...rows, letter, heading, a: shown(t, a), b: shown(t, b) }));
  if (differ.length > 5) listed.push(t("upload.moreColumns", { count: String(differ.length - 5) }));
  return t("upload.duplicateDiffer", { ...rows, columns: listWords(listed, t.locale) });
}

/** What to say about a sheet with plot rows but not one value in them (an unfilled template). */
function nothingFilledIn(t: Translator, sheet: RecordingSheet, read: ReadResult): string {
  if (read.rows.length === 0) return t("refusals.noPlotRows");
  const today = todayIso();
  const sownOn = sheet.enrolment.sownOn;
  const due = sownOn ? sheet.columns.filter((c) => c.dueDay !== null && addDays(sownOn, c.dueDay) <= today) : [];
  const named = (cols: typeof sheet.columns) =>
    listWords([...cols.slice(0, 4).map((c) => t("refusals.columnAt", { name: c.name, letter: read.letters[c.key]! })), ...(cols.length > 4 ? [t("refusals.moreItems", { count: String(cols.length - 4) })] : [])], t.locale);
  const what = due.length > 0 ? t("refusals.dueByNow", { columns: named(due) }) : t("refusals.forExample", { columns: named(sheet.columns) });
  return t("refusals.nothingFilled", { what });
}

async function prepare(viewer: Viewer, t: UploadTarget) {
  let read: ReadResult;
  const tr = translatorFor(viewer.locale);
  const sheet = await getRecordingSheet(viewer, { trialId: t.trialId, siteId: t.siteId });
  if (!sheet) throw new AppError("not_found", tr("forms.notYours"));
  try {
    const kind = inspectUpload(t.bytes, t.fileName, tr);
    read = await readUpload(t.bytes, kind, { columns: sheet.columns, plotCodes: sheet.plots.map((p) => p.plotCode) }, tr);
  } catch (e) {
    if (e instanceof UploadRefused) return { refused: e.message, sheetName: e.sheet, sheet, read: null, cells: [], rowProblems: [] };
    throw e;
  }
  const byCode = new Map(sheet.plots.map((p) => [p.plotCode.toUpperCase(), p]));
  const firstRow = new Map<string, SheetRow>();
  const rowProblems: UploadProblem[] = [];
  const cells: CellInput[] = [];
  const plotColumn = tr("upload.columnHeading", { letter: read.letters["#plot"]!, heading: "Plot" });
  for (const r of read.rows) {
    const code = r.plotCode.toUpperCase();
    if (!code) {
      const filled = Object.entries(r.values).filter(([, v]) => cellText(v) !== "").map(([key]) => `${read.letters[key]}${r.row}`);
      const holds = filled.length > 0 ? tr("upload.holds", { count: filled.length, cells: filled.slice(0, 3).join(", "), more: filled.length > 3 ? "yes" : "no" }) : "";
      rowProblems.push({ row: r.row, column: plotColumn, message: tr("upload.noPlotId", { cell: `${read.letters["#plot"]}${r.row}`, holds }) });
      continue;
    }
    const earlier = firstRow.get(code);
    if (earlier) {
      rowProblems.push({ row: r.row, column: plotColumn, message: duplicateMessage(tr, earlier, r, read, sheet) });
      continue;
    }
    firstRow.set(code, r);
    const plot = byCode.get(code);
    if (plot) {
      // A sorted or shifted sheet shows up as a block or code that no longer matches the plot id.
      if (r.block !== "" && r.block !== String(plot.block)) rowProblems.push({ row: r.row, column: tr("upload.columnHeading", { letter: read.letters["#block"]!, heading: "Block" }), message: tr("upload.wrongBlock", { plot: plot.plotCode, block: String(plot.block), said: r.block }) });
      if (r.code !== "" && r.code.toUpperCase() !== plot.blindCode.toUpperCase()) rowProblems.push({ row: r.row, column: tr("upload.columnHeading", { letter: read.letters["#code"]!, heading: "Code" }), message: tr("upload.wrongCode", { plot: plot.plotCode, code: plot.blindCode, said: r.code }) });
    }
    for (const [key, raw] of Object.entries(r.values)) {
      // An empty cell leaves a recorded value alone, so an older copy of the sheet never erases phone entries.
      if (raw === null || raw === undefined || (typeof raw === "string" && raw.trim() === "")) continue;
      cells.push({ plotCode: r.plotCode, key, raw, row: r.row });
    }
  }
  if (cells.length === 0 && rowProblems.length === 0) return { refused: nothingFilledIn(tr, sheet, read), sheetName: read.sheet, sheet, read: null, cells, rowProblems };
  return { refused: null, sheetName: read.sheet, sheet, read, cells, rowProblems };
}

/**
 * Checks an uploaded sheet and reports what saving it would do (new, changed and unchanged values) and
 * every problem by row and column. Writes nothing.
 */
export async function previewUpload(viewer: Viewer, t: UploadTarget) {
  return (await analyse(viewer, t)).preview;
}

async function analyse(viewer: Viewer, t: UploadTarget) {
  const prep = await prepare(viewer, t);
  if (prep.refused || !prep.read) {
    return { cells: prep.cells, textNumberCommas: undefined, preview: { ok: false as const, refused: prep.refused, sheet: prep.sheetName, otherSheets: [] as string[], problems: [] as UploadProblem[], warnings: [] as UploadProblem[] } };
  }
  const { textNumberCommas } = prep.read;
  const plan = await planSiteObservations(db, viewer, { trialId: t.trialId, siteId: t.siteId, cells: prep.cells, textNumberCommas });
  const letters = prep.read.letters;
  const tr = translatorFor(viewer.locale);
  const problems: UploadProblem[] = [
    ...prep.rowProblems,
    ...plan.problems.map((p) => ({ row: p.row ?? null, column: place(tr, p.row, p.key ? letters[p.key] : undefined, p.column), message: p.message })),
  ].sort((a, b) => (a.row ?? 0) - (b.row ?? 0));
  // Values that save but are worth a second look; they never stop the save.
  const warnings: UploadProblem[] = plan.warnings.map((w) => ({ row: w.row ?? null, column: place(tr, w.row, letters[w.key], w.column), message: w.message }));
  const changes = plan.changes
    .filter((c) => c.kind !== "unchanged")
    .slice(0, MAX_PREVIEW_CHANGES)
    .map((c) => ({ row: c.row ?? null, plotCode: c.plotCode, column: c.column.heading, kind: c.kind, oldValue: displayEntry(c.column, c.oldValue, c.oldReason), newValue: displayEntry(c.column, c.newValue, c.newReason) }));
  return {
    cells: prep.cells,
    textNumberCommas,
    preview: {
      ok: problems.length === 0,
      refused: null,
      /** The worksheet that was read, and the ones that were not (workbooks only). */
      sheet: prep.read.sheet,
      otherSheets: prep.read.otherSheets,
      rows: prep.read.rows.length,
      blankRows: prep.read.blankRows,
      counts: plan.counts,
      problems,
      warnings,
      changes,
    },
  };
}
export type UploadPreview = Awaited<ReturnType<typeof previewUpload>>;

/** Saves an uploaded sheet: every value in one transaction, or nothing when any row has a problem. */
export async function commitUpload(viewer: Viewer, t: UploadTarget) {
  const { preview, cells, textNumberCommas } = await analyse(viewer, t);
  if (!preview.ok) return { ok: false as const, preview };
  // Saving checks everything again under the site's lock, in case values changed since the preview.
  const result = await saveSiteObservations(viewer, { trialId: t.trialId, siteId: t.siteId, cells, source: "upload", textNumberCommas });
  return { ok: true as const, saved: result.saved, counts: result.counts };
}
