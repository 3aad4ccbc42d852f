import type { Locale } from "@/lib/domain/vocabulary/enums";
import ExcelJS from "exceljs";
import type { EntryColumn } from "@/lib/domain/observations/columns";
import type { TextNumberCommas } from "@/lib/domain/observations/values";
import { decodeCsv, parseCsvRecords } from "./csv";
import { UploadRefused, type UploadKind } from "./safety";
import { restoreText } from "./write";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

// Turns an uploaded template (xlsx or CSV) into plot rows. Anything that makes the layout of the sheet
// uncertain (formulas, merged cells, unknown or missing columns, short CSV lines, two sheets that could hold
// the plots, values far below them) refuses the whole file, with a message naming the row, cell or sheet,
// in the grower's language (the Translator passed in; English when none).

export const FIXED_HEADINGS = ["Plot", "Block", "Code"] as const;
export const PLOT_SHEET = "Plots";
export const MAX_ROWS = 20_000;
/** More empty rows than this between two rows means the lower one is not part of the plot list. */
const FAR_BELOW_GAP = 50;
/** How far down a sheet to look for headings that were moved off row 1. */
const HEADING_SEARCH_ROWS = 20;

export interface SheetRow {
  row: number;
  plotCode: string;
  block: string;
  code: string;
  values: Record<string, unknown>;
}

export interface ReadResult {
  rows: SheetRow[];
  blankRows: number[];
  /** Column letter of each key, for messages that name row and column. */
  letters: Record<string, string>;
  /** The worksheet that was read (workbooks only). */
  sheet: string | null;
  /** The workbook's other worksheets, which were not read. */
  otherSheets: string[];
  /** How a number written as text with a comma is read (see parseNumberText). */
  textNumberCommas: TextNumberCommas;
}

export interface ReadContext {
  columns: EntryColumn[];
  /** The site's plot codes, to recognise plot rows on a sheet whose headings are missing. */
  plotCodes: string[];
}

/** A sheet as read: its first row and every row that holds anything, by row number (1 = headings). */
interface Table {
  header: unknown[];
  rows: { row: number; line?: number; cells: unknown[] }[];
}

const norm = (s: string) => s.replace(/\s+/g, " ").trim().toLowerCase();
const isEmpty = (v: unknown) => v === null || v === undefined || (typeof v === "string" && v.trim() === "");
const asText = (v: unknown) => (v === null || v === undefined ? "" : v instanceof Date ? v.toISOString().slice(0, 10) : String(v));

export function columnLetter(index: number): string {
  let n = index + 1;
  let s = "";
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

/** "A", "A and B", "A, B and C" */
export function listWords(items: string[], locale: Locale = "en"): string {
  if (locale !== "en") return new Intl.ListFormat(locale, { type: "conjunction" }).format(items);
  return items.length <= 1 ? (items[0] ?? "") : `${items.slice(0, -1).join(", ")} and ${items.at(-1)}`;
}

/** Each heading of the template (normalised) with the key it stands for; fixed columns start with "#". */
function expectedHeadings(columns: EntryColumn[]): Map<string, string> {
  const expected = new Map<string, string>();
  for (const h of FIXED_HEADINGS) expected.set(norm(h), `#${h.toLowerCase()}`);
  for (const c of columns) expected.set(norm(c.heading), c.key);
  return expected;
}

const matchCount = (cells: unknown[], expected: Map<string, string>) => cells.filter((v) => expected.has(norm(asText(v)))).length;

/**
 * Refuses a first row that holds none of the template's headings with one plain message: the headings were
 * moved down, or the heading row was deleted (row 1 then holds a plot's values).
 */
function checkHeadingRow(t: Table, expected: Map<string, string>, words: Translator) {
  if (matchCount(t.header, expected) > 0) return;
  const moved = t.rows.find((r) => r.row > 1 && r.row <= HEADING_SEARCH_ROWS && matchCount(r.cells, expected) >= 2);
  if (moved) {
    throw new UploadRefused(words("refusals.headingsMoved", { row: String(moved.row), second: moved.row === 2 ? "yes" : "no", last: String(moved.row - 1) }));
  }
  const shown = t.header.map(asText).filter((v) => v.trim() !== "");
  const cells = `${shown.slice(0, 3).map((v) => `"${v.trim().slice(0, 40)}"`).join(", ")}${shown.length > 3 ? " …" : ""}`;
  throw new UploadRefused(words("refusals.headingsMissing", { empty: shown.length === 0 ? "yes" : "no", cells }));
}

/** Matches the header row against the template's headings; returns column index → key ("" for none). */
function matchHeader(header: string[], columns: EntryColumn[], t: Translator): string[] {
  const expected = expectedHeadings(columns);
  const keys: string[] = [];
  const problems: string[] = [];
  const found = new Set<string>();
  let last = header.length;
  while (last > 0 && header[last - 1]!.trim() === "") last -= 1;
  for (let i = 0; i < last; i += 1) {
    const h = header[i]!.trim();
    const key = expected.get(norm(h));
    const letter = columnLetter(i);
    if (!h) problems.push(t("refusals.noHeading", { letter }));
    else if (!key) problems.push(t("refusals.notTrialColumn", { letter, heading: h }));
    else if (found.has(key)) problems.push(t("refusals.columnTwice", { letter, heading: h }));
    else found.add(key);
    keys.push(key ?? "");
  }
  for (const [heading, key] of [...FIXED_HEADINGS.map((h) => [h, `#${h.toLowerCase()}`] as const), ...columns.map((c) => [c.heading, c.key] as const)]) {
    if (!found.has(key)) problems.push(t("refusals.columnMissing", { heading }));
  }
  if (problems.length > 0) throw new UploadRefused(t("refusals.columnsMismatch", { problems: problems.join(" ") }));
  return keys;
}

/** Cell names ("D7") of the values in one row, at most `limit`. */
function filledCells(row: number, cells: unknown[], limit = 3): string[] {
  const out: string[] = [];
  cells.forEach((v, i) => {
    if (out.length < limit && !isEmpty(v)) out.push(`${columnLetter(i)}${row}`);
  });
  return out;
}

/** Refuses values far below the plot list (a stray keystroke at the bottom of the sheet), naming their cells. */
function checkFarBelow(rows: Table["rows"], t: Translator) {
  let previous = 1;
  for (let i = 0; i < rows.length; i += 1) {
    if (rows[i]!.row - previous - 1 > FAR_BELOW_GAP) {
      const stray = rows.slice(i);
      const cells = stray.flatMap((r) => filledCells(r.row, r.cells)).slice(0, 3);
      const one = cells.length === 1 && stray.length === 1 && stray[0]!.cells.filter((v) => !isEmpty(v)).length === 1;
      const others = stray.reduce((n, r) => n + r.cells.filter((v) => !isEmpty(v)).length, 0) > cells.length;
      throw new UploadRefused(t("refusals.farBelow", { one: one ? "yes" : "no", cells: listWords(cells, t.locale), others: others ? "yes" : "no", last: String(previous) }));
    }
    previous = rows[i]!.row;
  }
}

/** Refuses CSV lines with fewer fields than the heading line: their last values were lost, not left empty. */
function checkShortLines(rows: Table["rows"], width: number, header: string[], t: Translator) {
  const short = rows.filter((r) => r.cells.length < width);
  if (short.length === 0) return;
  const describe = (r: Table["rows"][number]) => {
    const lacking = header.slice(r.cells.length, width).map((h, j) => t("refusals.lackingColumn", { heading: h.trim() || t("refusals.noHeadingName"), letter: columnLetter(r.cells.length + j) }));
    const at = r.line !== undefined && r.line !== r.row ? t("refusals.lineOfRow", { line: String(r.line), row: String(r.row) }) : t("refusals.line", { line: String(r.row) });
    const named = lacking.length > 4 ? [...lacking.slice(0, 4), t("refusals.moreItems", { count: String(lacking.length - 4) })] : lacking;
    return t("refusals.shortLine", { at, have: String(r.cells.length), width: String(width), lacking: listWords(named, t.locale) });
  };
  const listed = short.slice(0, 5).map(describe).join(" ");
  throw new UploadRefused(t("refusals.shortLines", { listed, more: short.length > 5 ? String(short.length - 5) : "none", one: short.length === 1 ? "yes" : "no" }));
}

function toRows(t: Table, ctx: ReadContext, kind: UploadKind, words: Translator): Omit<ReadResult, "sheet" | "otherSheets"> {
  const expected = expectedHeadings(ctx.columns);
  checkHeadingRow(t, expected, words);
  const header = t.header.map((v) => restoreText(asText(v)));
  const keys = matchHeader(header, ctx.columns, words);
  const body = t.rows.filter((r) => r.row > 1 && r.cells.some((v) => !isEmpty(v)));
  if (body.length > MAX_ROWS) throw new UploadRefused(words("refusals.tooManyRows", { count: String(body.length), max: String(MAX_ROWS) }));
  checkFarBelow(body, words);
  if (kind === "csv") checkShortLines(body, keys.length, header, words);
  const rows: SheetRow[] = [];
  const blankRows: number[] = [];
  let previous = 1;
  for (const { row, cells } of body) {
    for (let r = previous + 1; r < row; r += 1) blankRows.push(r);
    previous = row;
    const values: Record<string, unknown> = {};
    let plotCode = "";
    let block = "";
    let code = "";
    // Cells may be sparse (a workbook row), so only present ones are visited.
    cells.forEach((cell, i) => {
      const key = keys[i];
      if (!key) {
        if (!isEmpty(cell)) throw new UploadRefused(words("refusals.strayValue", { row: String(row), cell: `${columnLetter(i)}${row}` }));
        return;
      }
      const v = typeof cell === "string" ? restoreText(cell) : cell;
      if (key === "#plot") plotCode = asText(v).trim();
      else if (key === "#block") block = asText(v).trim();
      else if (key === "#code") code = asText(v).trim();
      else values[key] = v;
    });
    rows.push({ row, plotCode, block, code, values });
  }
  const letters: Record<string, string> = {};
  keys.forEach((k, i) => {
    if (k) letters[k] = columnLetter(i);
  });
  // A workbook stores numbers as numbers, so a number left as text with a comma was not taken for a decimal
  // by the grower's own spreadsheet program; a CSV has no types, and a ";" one uses decimal commas.
  return { rows, blankRows, letters, textNumberCommas: kind === "xlsx" ? "ask" : "decimal" };
}

/** A cell's value as exceljs gives it, refusing formulas and flattening rich text and hyperlinks. */
function cellValue(cell: ExcelJS.Cell, where: () => string, t: Translator): unknown {
  const v = cell.value as unknown;
  if (v === null || v === undefined) return null;
  if (typeof v === "object" && !(v instanceof Date)) {
    const o = v as Record<string, unknown>;
    if ("formula" in o || "sharedFormula" in o) throw new UploadRefused(t("refusals.formula", { where: where() }));
    if ("error" in o) throw new UploadRefused(t("refusals.cellError", { where: where(), error: String(o.error) }));
    if (Array.isArray(o.richText)) return (o.richText as { text: string }[]).map((t) => t.text).join("");
    if ("text" in o) return String(o.text);
    return null;
  }
  if (typeof v === "boolean") return v ? "yes" : "no";
  return v;
}

/** A cell's text for recognising a sheet, without refusing anything yet. */
function looseText(cell: ExcelJS.Cell): string {
  try {
    return asText(cellValue(cell, () => "", translatorFor()));
  } catch {
    return "";
  }
}

/** Whether a worksheet could hold the plot values: a template heading on row 1, or a plot id in column A. */
function couldHoldPlots(ws: ExcelJS.Worksheet, expected: Map<string, string>, plotCodes: Set<string>): boolean {
  let found = false;
  ws.getRow(1).eachCell((cell) => {
    if (expected.has(norm(looseText(cell)))) found = true;
  });
  if (found) return true;
  ws.eachRow((row) => {
    if (!found && plotCodes.has(looseText(row.getCell(1)).trim().toUpperCase())) found = true;
  });
  return found;
}

const sheetLabel = (ws: ExcelJS.Worksheet, t: Translator) => t(ws.state && ws.state !== "visible" ? "refusals.hiddenSheetName" : "refusals.sheetName", { name: ws.name });

/**
 * Picks the worksheet to read: the only one that could hold the plot values. Two or more such sheets are
 * refused, naming them, because saving the wrong one would record the wrong values.
 */
function pickSheet(wb: ExcelJS.Workbook, ctx: ReadContext, t: Translator): ExcelJS.Worksheet {
  const expected = expectedHeadings(ctx.columns);
  const plotCodes = new Set(ctx.plotCodes.map((c) => c.toUpperCase()));
  const candidates = wb.worksheets.filter((ws) => couldHoldPlots(ws, expected, plotCodes));
  if (candidates.length > 1) {
    throw new UploadRefused(t("refusals.twoSheets", { sheets: listWords(candidates.map((ws) => sheetLabel(ws, t)), t.locale), two: candidates.length === 2 ? "yes" : "no" }));
  }
  const ws = candidates[0] ?? wb.getWorksheet(PLOT_SHEET) ?? wb.worksheets[0];
  if (!ws) throw new UploadRefused(t("refusals.noSheets"));
  return ws;
}

/** Every row of a worksheet that holds anything, without creating the empty rows in between. */
function worksheetTable(ws: ExcelJS.Worksheet, t: Translator): Table {
  const merges = ((ws.model as unknown as { merges?: string[] }).merges ?? []).filter(Boolean);
  if (merges.length > 0) throw new UploadRefused(t("refusals.mergedCells", { cells: merges.slice(0, 3).join(", ") }));
  const header: unknown[] = [];
  ws.getRow(1).eachCell((cell, c) => {
    header[c - 1] = asText(cellValue(cell, () => t("refusals.headingCell", { letter: columnLetter(c - 1) }), t));
  });
  const rows: Table["rows"] = [];
  ws.eachRow((row, r) => {
    if (r === 1) return;
    const cells: unknown[] = [];
    row.eachCell((cell, c) => {
      const at = { row: String(r), letter: columnLetter(c - 1) };
      cells[c - 1] = cellValue(cell, () => (header[c - 1] ? t("refusals.rowCellHeading", { ...at, heading: asText(header[c - 1]) }) : t("refusals.rowCell", at)), t);
    });
    if (!cells.some((v) => !isEmpty(v))) return;
    if (rows.length >= MAX_ROWS) throw new UploadRefused(t("refusals.tooManyRowsSoFar", { max: String(MAX_ROWS) }));
    rows.push({ row: r, cells });
  });
  return { header, rows };
}

/** Reads the plots of an uploaded workbook or CSV into rows keyed by column; refusals in the language of `t`. */
export async function readUpload(bytes: Uint8Array, kind: UploadKind, ctx: ReadContext, t: Translator = translatorFor()): Promise<ReadResult> {
  if (kind === "csv") {
    const { records } = parseCsvRecords(decodeCsv(bytes, t), { t });
    for (const r of records) {
      if (r.row === 1) continue;
      r.cells.forEach((v, i) => {
        if (/^\s*=/.test(v)) throw new UploadRefused(t("refusals.csvFormula", { row: String(r.row), letter: columnLetter(i), heading: records[0]?.row === 1 ? (records[0].cells[i] ?? "") : "" }));
      });
    }
    const header = records[0]?.row === 1 ? records[0].cells : [];
    const table = { header, rows: records.filter((r) => r.row > 1) };
    return { ...toRows(table, ctx, "csv", t), sheet: null, otherSheets: [] };
  }
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  } catch {
    throw new UploadRefused(t("refusals.cannotOpen"));
  }
  const ws = pickSheet(wb, ctx, t);
  try {
    const read = toRows(worksheetTable(ws, t), ctx, "xlsx", t);
    return { ...read, sheet: ws.name, otherSheets: wb.worksheets.filter((w) => w !== ws).map((w) => w.name) };
  } catch (e) {
    if (e instanceof UploadRefused) throw new UploadRefused(t("refusals.onSheet", { sheet: ws.name, message: e.message }), ws.name);
    throw e;
  }
}
