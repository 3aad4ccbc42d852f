import "server-only";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/auth/types";
import { getRecordingSheet } from "@/db/queries/observations";
import { planSiteObservations, saveSiteObservations, type CellInput } from "@/db/mutations/observations";
import { db } from "@/db/index";
import { displayEntry } from "@/lib/observations/values";
import { readUpload, type ReadResult } from "./read";
import { inspectUpload, UploadRefused } from "./safety";

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
function place(row: number | undefined, letter: string | undefined, heading: string | undefined) {
  if (row === undefined) return null;
  return letter ? `column ${letter}${heading ? ` (${heading})` : ""}` : heading ?? null;
}

async function prepare(viewer: Viewer, t: UploadTarget) {
  let read: ReadResult;
  const sheet = await getRecordingSheet(viewer, { trialId: t.trialId, siteId: t.siteId });
  if (!sheet) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
  try {
    const kind = inspectUpload(t.bytes, t.fileName);
    read = await readUpload(t.bytes, kind, sheet.columns);
  } catch (e) {
    if (e instanceof UploadRefused) return { refused: e.message, sheet, read: null, cells: [], rowProblems: [] };
    throw e;
  }
  const byCode = new Map(sheet.plots.map((p) => [p.plotCode.toUpperCase(), p]));
  const firstRow = new Map<string, number>();
  const rowProblems: UploadProblem[] = [];
  const cells: CellInput[] = [];
  for (const r of read.rows) {
    const code = r.plotCode.toUpperCase();
    if (!code) {
      rowProblems.push({ row: r.row, column: `column ${read.letters["#plot"]} (Plot)`, message: "The plot id is empty. Every row needs the plot id from the template." });
      continue;
    }
    if (firstRow.has(code)) {
      rowProblems.push({ row: r.row, column: `column ${read.letters["#plot"]} (Plot)`, message: `Plot ${r.plotCode} is also on row ${firstRow.get(code)}. Keep one row per plot.` });
      continue;
    }
    firstRow.set(code, r.row);
    const plot = byCode.get(code);
    if (plot) {
      // A sorted or shifted sheet shows up as a block or code that no longer matches the plot id.
      if (r.block !== "" && r.block !== String(plot.block)) rowProblems.push({ row: r.row, column: `column ${read.letters["#block"]} (Block)`, message: `Plot ${plot.plotCode} is in block ${plot.block}, but this row says block ${r.block}. Check the row was not moved.` });
      if (r.code !== "" && r.code.toUpperCase() !== plot.blindCode.toUpperCase()) rowProblems.push({ row: r.row, column: `column ${read.letters["#code"]} (Code)`, message: `Plot ${plot.plotCode} has code ${plot.blindCode}, but this row says ${r.code}. Check the row was not moved.` });
    }
    for (const [key, raw] of Object.entries(r.values)) {
      // An empty cell leaves a recorded value alone, so an older copy of the sheet never erases phone entries.
      if (raw === null || raw === undefined || (typeof raw === "string" && raw.trim() === "")) continue;
      cells.push({ plotCode: r.plotCode, key, raw, row: r.row });
    }
  }
  return { refused: null, sheet, read, cells, rowProblems };
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
  if (prep.refused || !prep.read) return { cells: prep.cells, preview: { ok: false as const, refused: prep.refused, problems: [] as UploadProblem[] } };
  const plan = await planSiteObservations(db, viewer, { trialId: t.trialId, siteId: t.siteId, cells: prep.cells });
  const letters = prep.read.letters;
  const problems: UploadProblem[] = [
    ...prep.rowProblems,
    ...plan.problems.map((p) => ({ row: p.row ?? null, column: place(p.row, p.key ? letters[p.key] : undefined, p.column), message: p.message })),
  ].sort((a, b) => (a.row ?? 0) - (b.row ?? 0));
  const changes = plan.changes
    .filter((c) => c.kind !== "unchanged")
    .slice(0, MAX_PREVIEW_CHANGES)
    .map((c) => ({ row: c.row ?? null, plotCode: c.plotCode, column: c.column.heading, kind: c.kind, oldValue: displayEntry(c.column, c.oldValue, c.oldReason), newValue: displayEntry(c.column, c.newValue, c.newReason) }));
  return {
    cells: prep.cells,
    preview: {
      ok: problems.length === 0,
      refused: null,
      rows: prep.read.rows.length,
      blankRows: prep.read.blankRows,
      counts: plan.counts,
      problems,
      changes,
    },
  };
}
export type UploadPreview = Awaited<ReturnType<typeof previewUpload>>;

/** Saves an uploaded sheet: every value in one transaction, or nothing when any row has a problem. */
export async function commitUpload(viewer: Viewer, t: UploadTarget) {
  const { preview, cells } = await analyse(viewer, t);
  if (!preview.ok) return { ok: false as const, preview };
  // Saving checks everything again under the site's lock, in case values changed since the preview.
  const result = await saveSiteObservations(viewer, { trialId: t.trialId, siteId: t.siteId, cells, source: "upload" });
  return { ok: true as const, saved: result.saved, counts: result.counts };
}
