import ExcelJS from "exceljs";

// The one writer for every spreadsheet Seedplot hands out, CSV or xlsx: analysis exports, site data
// sheets and templates, public downloads. Names and notes come from coordinators and growers, so any text
// may be hostile; nothing here trusts a cell to be plain.

/** What a cell may hold. Numbers stay numbers (a negative number is data, not a formula). */
export type SheetCell = string | number | boolean | Date | null | undefined;

// Text a spreadsheet program runs as a formula: = + - @ first (also the full-width forms some locales
// accept), possibly after blanks, or a leading tab or line break (OWASP CSV injection guidance, from
// memory). Quoting is not enough on its own: where the list separator is ";", a program splits a comma
// file at every ";" and ignores quotes that are not at the start of a field, so "Ember;=1+1" still yields
// a cell "=1+1". Every stretch of text after a comma, semicolon, tab or line break is therefore guarded too.
const FORMULA_START = /^[ \u3000]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]/;
const CONTROL_START = /^[\t\r\n]/;
const SEPARATORS = /([,;\t\r\n])/;

// A stretch counts as risky after any apostrophes already in front of it, so adding exactly one apostrophe
// to every risky stretch can be undone exactly, even for text that genuinely starts with "'=".
const risky = (stretch: string, start: RegExp) => start.test(stretch.replace(/^'+/, ""));

function mapStretches(text: string, change: (stretch: string) => string): string {
  return text
    .split(SEPARATORS)
    .map((part, i) => (i % 2 === 0 ? change(part) : part))
    .join("");
}

/**
 * Text made safe to open in a spreadsheet: the text, and every stretch of it after a separator or line
 * break, gets a leading apostrophe (the usual way to say "this is text") when it would start a formula;
 * so does text starting with a tab or line break. `restoreText` gives back exactly what was written.
 */
export function neutraliseText(text: string): string {
  const body = mapStretches(text, (stretch) => (risky(stretch, FORMULA_START) ? `'${stretch}` : stretch));
  return risky(body, CONTROL_START) ? `'${body}` : body;
}

/** Undoes `neutraliseText` on upload, so a sheet exported and uploaded again keeps its values. */
export function restoreText(text: string): string {
  const body = text.startsWith("'") && risky(text, CONTROL_START) ? text.slice(1) : text;
  return mapStretches(body, (stretch) => (stretch.startsWith("'") && risky(stretch, FORMULA_START) ? stretch.slice(1) : stretch));
}

function plainText(cell: Exclude<SheetCell, null | undefined | number>): string {
  if (typeof cell === "boolean") return String(cell);
  if (cell instanceof Date) return cell.toISOString().endsWith("T00:00:00.000Z") ? cell.toISOString().slice(0, 10) : cell.toISOString();
  return cell;
}

/**
 * One CSV field: numbers as written (non-finite ones empty), text neutralised, and quoted when it holds a
 * comma or semicolon (either may be the list separator where the file is opened), a quote, a tab or a line break.
 */
export function csvField(cell: SheetCell): string {
  if (cell === null || cell === undefined) return "";
  if (typeof cell === "number") return Number.isFinite(cell) ? String(cell) : "";
  const text = neutraliseText(plainText(cell));
  return /[",;\t\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** One CSV line (no line ending). */
export function csvRow(cells: readonly SheetCell[]): string {
  return cells.map(csvField).join(",");
}

/** A whole CSV file: a byte-order mark so spreadsheet programs read UTF-8, CRLF line endings (RFC 4180). */
export function csvFile(rows: readonly (readonly SheetCell[])[]): string {
  return `\uFEFF${rows.map(csvRow).join("\r\n")}\r\n`;
}

/**
 * One xlsx cell value: text is always a plain string cell (never a formula object) and neutralised like
 * CSV text, so a value copied out of the workbook stays inert; numbers, booleans and dates keep their type.
 */
export function xlsxValue(cell: SheetCell): ExcelJS.CellValue {
  if (cell === null || cell === undefined) return null;
  if (typeof cell === "number") return Number.isFinite(cell) ? cell : null;
  if (typeof cell === "boolean" || cell instanceof Date) return cell;
  return neutraliseText(String(cell));
}

/** Adds one row to a worksheet through `xlsxValue`. */
export function addSheetRow(sheet: ExcelJS.Worksheet, cells: readonly SheetCell[]): ExcelJS.Row {
  return sheet.addRow(cells.map(xlsxValue));
}

/** A named table of rows: one sheet of a workbook, or one CSV file. */
export interface SheetTable {
  name: string;
  columns: readonly string[];
  rows: readonly (readonly SheetCell[])[];
}

/** Tables as one .xlsx workbook: a sheet each, its heading row bold and frozen, columns as wide as their headings need. */
export async function tablesXlsx(tables: readonly SheetTable[]): Promise<Uint8Array<ArrayBuffer>> {
  const workbook = new ExcelJS.Workbook();
  workbook.creator = "Seedplot";
  for (const table of tables) {
    const sheet = workbook.addWorksheet(table.name);
    addSheetRow(sheet, table.columns).font = { bold: true };
    for (const row of table.rows) addSheetRow(sheet, row);
    sheet.views = [{ state: "frozen", ySplit: 1 }];
    sheet.columns.forEach((column, i) => (column.width = Math.min(60, Math.max(10, table.columns[i]!.length + 4))));
  }
  return new Uint8Array((await workbook.xlsx.writeBuffer()) as ArrayBuffer);
}
