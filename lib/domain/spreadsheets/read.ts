import type { Locale } from "@/lib/domain/vocabulary/enums";
import ExcelJS from "exceljs";
import type { EntryColumn } from "@/lib/domain/observations/columns";
import type { TextNumberCommas } from "@/lib/domain/observations/values";
import { decodeCsv, parseCsvRecords } from "./csv";
import { UploadRefused, type UploadKind } from "./safety";
import { restoreText } from "./write";

// Turns an uploaded template (xlsx or CSV) into plot rows. Anything that makes the layout of the sheet
// uncertain (formulas, merged cells, unknown or missing columns, short CSV lines, two sheets that could hold
// the plots, values far below them) refuses the whole file, with a message naming the row, cell or sheet.

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
function checkHeadingRow(t: Table, expected: Map<string, string>) {
  if (matchCount(t.header, expected) > 0) return;
  const moved = t.rows.find((r) => r.row > 1 && r.row <= HEADING_SEARCH_ROWS && matchCount(r.cells, expected) >= 2);
  if (moved) {
    throw new UploadRefused(`The column headings are on row ${moved.row}, but they must be on row 1. Delete the ${moved.row === 2 ? "row" : "rows"} above them (${moved.row === 2 ? "row 1" : `rows 1 to ${moved.row - 1}`}) and upload again.`);
  }
  const shown = t.header.map(asText).filter((v) => v.trim() !== "");
  const holds = shown.length === 0 ? "it is empty" : `it holds ${shown.slice(0, 3).map((v) => `"${v.trim().slice(0, 40)}"`).join(", ")}${shown.length > 3 ? " …" : ""}`;
  throw new UploadRefused(
    `Row 1 must hold the column headings from the template (Plot, Block, Code and one heading for each value), but ${holds}, so the heading row seems to be missing. Copy row 1 from a fresh template (download it from this page), insert it above your first plot, and upload again.`,
  );
}

/** Matches the header row against the template's headings; returns column index → key ("" for none). */
function matchHeader(header: string[], columns: EntryColumn[]): string[] {
  const expected = expectedHeadings(columns);
  const keys: string[] = [];
  const problems: string[] = [];
  const found = new Set<string>();
  let last = header.length;
  while (last > 0 && header[last - 1]!.trim() === "") last -= 1;
  for (let i = 0; i < last; i += 1) {
    const h = header[i]!.trim();
    const key = expected.get(norm(h));
    if (!h) problems.push(`Column ${columnLetter(i)} has no heading. Delete the column or give it back its heading from the template.`);
    else if (!key) problems.push(`Column ${columnLetter(i)} "${h}" is not one of this trial's columns. Use the headings from the template exactly, without renaming them.`);
    else if (found.has(key)) problems.push(`Column ${columnLetter(i)} "${h}" appears twice. Keep one of them.`);
    else found.add(key);
    keys.push(key ?? "");
  }
  for (const [heading, key] of [...FIXED_HEADINGS.map((h) => [h, `#${h.toLowerCase()}`] as const), ...columns.map((c) => [c.heading, c.key] as const)]) {
    if (!found.has(key)) problems.push(`The column "${heading}" is missing. Download a fresh template, or add the column back with that exact heading.`);
  }
  if (problems.length > 0) throw new UploadRefused(`The columns do not match this trial's template. ${problems.join(" ")}`);
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
function checkFarBelow(rows: Table["rows"]) {
  let previous = 1;
  for (let i = 0; i < rows.length; i += 1) {
    if (rows[i]!.row - previous - 1 > FAR_BELOW_GAP) {
      const stray = rows.slice(i);
      const cells = stray.flatMap((r) => filledCells(r.row, r.cells)).slice(0, 3);
      const one = cells.length === 1 && stray.length === 1 && stray[0]!.cells.filter((v) => !isEmpty(v)).length === 1;
      const what = one ? `a value in cell ${cells[0]}` : `values in cells ${listWords(cells)}${stray.reduce((n, r) => n + r.cells.filter((v) => !isEmpty(v)).length, 0) > cells.length ? " and others" : ""}`;
      throw new UploadRefused(`There ${one ? "is" : "are"} ${what}, far below the plots (the rows above ${one ? "it" : "them"} end at row ${previous}). Delete ${one ? "it" : "them"}, or move ${one ? "it" : "them"} into the right plot's row, and upload again.`);
    }
    previous = rows[i]!.row;
  }
}

/** Refuses CSV lines with fewer fields than the heading line: their last values were lost, not left empty. */
function checkShortLines(rows: Table["rows"], width: number, header: string[]) {
  const short = rows.filter((r) => r.cells.length < width);
  if (short.length === 0) return;
  const describe = (r: Table["rows"][number]) => {
    const lacking = header.slice(r.cells.length, width).map((h, j) => `${h.trim() || "(no heading)"} (column ${columnLetter(r.cells.length + j)})`);
    const at = r.line !== undefined && r.line !== r.row ? `Line ${r.line} (row ${r.row})` : `Line ${r.row}`;
    return `${at} has ${r.cells.length} of the ${width} fields, so it has no place for ${listWords(lacking.length > 4 ? [...lacking.slice(0, 4), `${lacking.length - 4} more`] : lacking)}.`;
  };
  const listed = short.slice(0, 5).map(describe).join(" ");
  const more = short.length > 5 ? ` ${short.length - 5} more lines are short too.` : "";
  throw new UploadRefused(
    `${listed}${more} A line with fewer fields than the heading line has lost values or separators, so nothing was saved. Check ${short.length === 1 ? "that line" : "those lines"} in your spreadsheet program (every plot row needs a field for every column, even an empty one), save the file as CSV again, and upload it.`,
  );
}

function toRows(t: Table, ctx: ReadContext, kind: UploadKind): Omit<ReadResult, "sheet" | "otherSheets"> {
  const expected = expectedHeadings(ctx.columns);
  checkHeadingRow(t, expected);
  const header = t.header.map((v) => restoreText(asText(v)));
  const keys = matchHeader(header, ctx.columns);
  const body = t.rows.filter((r) => r.row > 1 && r.cells.some((v) => !isEmpty(v)));
  if (body.length > MAX_ROWS) throw new UploadRefused(`The sheet has ${body.length} rows with values; the limit is ${MAX_ROWS}. Split it into smaller files.`);
  checkFarBelow(body);
  if (kind === "csv") checkShortLines(body, keys.length, header);
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
        if (!isEmpty(cell)) throw new UploadRefused(`Row ${row} has a value in cell ${columnLetter(i)}${row}, a column with no heading. Delete it or move it into the right column.`);
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
function cellValue(cell: ExcelJS.Cell, where: () => string): unknown {
  const v = cell.value as unknown;
  if (v === null || v === undefined) return null;
  if (typeof v === "object" && !(v instanceof Date)) {
    const o = v as Record<string, unknown>;
    if ("formula" in o || "sharedFormula" in o) throw new UploadRefused(`${where()} holds a formula. Replace formulas with the values themselves (copy, then Paste Values) and upload again.`);
    if ("error" in o) throw new UploadRefused(`${where()} shows a spreadsheet error (${String(o.error)}). Type the value itself.`);
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
    return asText(cellValue(cell, () => ""));
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

const sheetLabel = (ws: ExcelJS.Worksheet) => `"${ws.name}"${ws.state && ws.state !== "visible" ? " (a hidden sheet)" : ""}`;

/**
 * Picks the worksheet to read: the only one that could hold the plot values. Two or more such sheets are
 * refused, naming them, because saving the wrong one would record the wrong values.
 */
function pickSheet(wb: ExcelJS.Workbook, ctx: ReadContext): ExcelJS.Worksheet {
  const expected = expectedHeadings(ctx.columns);
  const plotCodes = new Set(ctx.plotCodes.map((c) => c.toUpperCase()));
  const candidates = wb.worksheets.filter((ws) => couldHoldPlots(ws, expected, plotCodes));
  if (candidates.length > 1) {
    throw new UploadRefused(
      `Sheets ${listWords(candidates.map(sheetLabel))} could each hold the plot values, so we cannot tell which one to save. Keep only the sheet you want saved (delete the ${candidates.length === 2 ? "other one" : "others"}, or move ${candidates.length === 2 ? "it" : "them"} to another file) and upload again.`,
    );
  }
  const ws = candidates[0] ?? wb.getWorksheet(PLOT_SHEET) ?? wb.worksheets[0];
  if (!ws) throw new UploadRefused("The workbook has no sheets.");
  return ws;
}

/** Every row of a worksheet that holds anything, without creating the empty rows in between. */
function worksheetTable(ws: ExcelJS.Worksheet): Table {
  const merges = ((ws.model as unknown as { merges?: string[] }).merges ?? []).filter(Boolean);
  if (merges.length > 0) throw new UploadRefused(`The sheet has merged cells (${merges.slice(0, 3).join(", ")}). Unmerge them so every plot has its own row, then upload again.`);
  const header: unknown[] = [];
  ws.getRow(1).eachCell((cell, c) => {
    header[c - 1] = asText(cellValue(cell, () => `Cell ${columnLetter(c - 1)}1 of the heading row`));
  });
  const rows: Table["rows"] = [];
  ws.eachRow((row, r) => {
    if (r === 1) return;
    const cells: unknown[] = [];
    row.eachCell((cell, c) => {
      cells[c - 1] = cellValue(cell, () => `Row ${r}, column ${columnLetter(c - 1)}${header[c - 1] ? ` ("${asText(header[c - 1])}")` : ""}`);
    });
    if (!cells.some((v) => !isEmpty(v))) return;
    if (rows.length >= MAX_ROWS) throw new UploadRefused(`The sheet has more than ${MAX_ROWS} rows with values; the limit is ${MAX_ROWS}. Split it into smaller files.`);
    rows.push({ row: r, cells });
  });
  return { header, rows };
}

/** Reads the plots of an uploaded workbook or CSV into rows keyed by column. */
export async function readUpload(bytes: Uint8Array, kind: UploadKind, ctx: ReadContext): Promise<ReadResult> {
  if (kind === "csv") {
    const { records } = parseCsvRecords(decodeCsv(bytes));
    for (const r of records) {
      if (r.row === 1) continue;
      r.cells.forEach((v, i) => {
        if (/^\s*=/.test(v)) throw new UploadRefused(`Row ${r.row}, column ${columnLetter(i)} ("${records[0]?.row === 1 ? (records[0].cells[i] ?? "") : ""}") starts with "=", which spreadsheet programs run as a formula. Type the value itself.`);
      });
    }
    const header = records[0]?.row === 1 ? records[0].cells : [];
    const table = { header, rows: records.filter((r) => r.row > 1) };
    return { ...toRows(table, ctx, "csv"), sheet: null, otherSheets: [] };
  }
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  } catch {
    throw new UploadRefused("This workbook could not be opened. Open it in your spreadsheet program, save it again as .xlsx and retry.");
  }
  const ws = pickSheet(wb, ctx);
  try {
    const read = toRows(worksheetTable(ws), ctx, "xlsx");
    return { ...read, sheet: ws.name, otherSheets: wb.worksheets.filter((w) => w !== ws).map((w) => w.name) };
  } catch (e) {
    if (e instanceof UploadRefused) throw new UploadRefused(`Sheet "${ws.name}": ${e.message}`, ws.name);
    throw e;
  }
}
