import ExcelJS from "exceljs";
import type { EntryColumn } from "@/lib/observations/columns";
import { decodeCsv, parseCsv } from "./csv";
import { UploadRefused, type UploadKind } from "./safety";
import { restoreText } from "./write";

// Turns an uploaded template (xlsx or CSV) into plot rows. Anything that makes the layout of the sheet
// uncertain (formulas, merged cells, unknown or missing columns) refuses the whole file.

export const FIXED_HEADINGS = ["Plot", "Block", "Code"] as const;
export const PLOT_SHEET = "Plots";
export const MAX_ROWS = 20_000;

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
}

const norm = (s: string) => s.replace(/\s+/g, " ").trim().toLowerCase();

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

/** Matches the header row against the template's headings; returns column index → key ("" for fixed). */
function matchHeader(header: string[], columns: EntryColumn[]): string[] {
  const expected = new Map<string, string>();
  for (const h of FIXED_HEADINGS) expected.set(norm(h), `#${h.toLowerCase()}`);
  for (const c of columns) expected.set(norm(c.heading), c.key);
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

function toRows(grid: unknown[][], columns: EntryColumn[]): ReadResult {
  const header = (grid[0] ?? []).map((v) => (v === null || v === undefined ? "" : restoreText(String(v))));
  if (header.every((h) => h.trim() === "")) throw new UploadRefused("The first row must hold the column headings from the template, but it is empty.");
  const keys = matchHeader(header, columns);
  if (grid.length - 1 > MAX_ROWS) throw new UploadRefused(`The sheet has ${grid.length - 1} rows; the limit is ${MAX_ROWS}. Split it into smaller files.`);
  const rows: SheetRow[] = [];
  const blankRows: number[] = [];
  for (let r = 1; r < grid.length; r += 1) {
    const line = grid[r] ?? [];
    const isBlank = line.every((v) => v === null || v === undefined || (typeof v === "string" && v.trim() === ""));
    if (isBlank) {
      blankRows.push(r + 1);
      continue;
    }
    const values: Record<string, unknown> = {};
    let plotCode = "";
    let block = "";
    let code = "";
    for (let i = 0; i < Math.max(line.length, keys.length); i += 1) {
      const key = keys[i];
      let v = line[i];
      if (!key) {
        if (v !== null && v !== undefined && String(v).trim() !== "") throw new UploadRefused(`Row ${r + 1} has a value in column ${columnLetter(i)}, which has no heading. Delete it or move it into the right column.`);
        continue;
      }
      if (typeof v === "string") v = restoreText(v);
      if (key === "#plot") plotCode = v === null || v === undefined ? "" : String(v).trim();
      else if (key === "#block") block = v === null || v === undefined ? "" : String(v).trim();
      else if (key === "#code") code = v === null || v === undefined ? "" : String(v).trim();
      else values[key] = v;
    }
    rows.push({ row: r + 1, plotCode, block, code, values });
  }
  const letters: Record<string, string> = {};
  keys.forEach((k, i) => {
    if (k) letters[k] = columnLetter(i);
  });
  return { rows, blankRows, letters };
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

/** Reads the plots sheet of an uploaded workbook or CSV into rows keyed by column. */
export async function readUpload(bytes: Uint8Array, kind: UploadKind, columns: EntryColumn[]): Promise<ReadResult> {
  if (kind === "csv") {
    const grid = parseCsv(decodeCsv(bytes));
    for (let r = 1; r < grid.length; r += 1) {
      grid[r]!.forEach((v, i) => {
        if (/^\s*=/.test(v)) throw new UploadRefused(`Row ${r + 1}, column ${columnLetter(i)} ("${grid[0]?.[i] ?? ""}") starts with "=", which spreadsheet programs run as a formula. Type the value itself.`);
      });
    }
    return toRows(grid, columns);
  }
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  } catch {
    throw new UploadRefused("This workbook could not be opened. Open it in your spreadsheet program, save it again as .xlsx and retry.");
  }
  const ws = wb.getWorksheet(PLOT_SHEET) ?? wb.worksheets[0];
  if (!ws) throw new UploadRefused("The workbook has no sheets.");
  const merges = ((ws.model as unknown as { merges?: string[] }).merges ?? []).filter(Boolean);
  if (merges.length > 0) throw new UploadRefused(`The sheet has merged cells (${merges.slice(0, 3).join(", ")}). Unmerge them so every plot has its own row, then upload again.`);
  const width = Math.max(ws.columnCount, ws.actualColumnCount);
  if (ws.rowCount > MAX_ROWS + 1) throw new UploadRefused(`The sheet has ${ws.rowCount - 1} rows; the limit is ${MAX_ROWS}. Split it into smaller files.`);
  const header: string[] = [];
  for (let c = 1; c <= width; c += 1) {
    const v = cellValue(ws.getCell(1, c), () => `Column ${columnLetter(c - 1)} of the heading row`);
    header.push(v === null ? "" : v instanceof Date ? v.toISOString().slice(0, 10) : String(v));
  }
  const grid: unknown[][] = [header];
  for (let r = 2; r <= ws.rowCount; r += 1) {
    const line: unknown[] = [];
    for (let c = 1; c <= width; c += 1) {
      line.push(cellValue(ws.getCell(r, c), () => `Row ${r}, column ${columnLetter(c - 1)} ("${header[c - 1] ?? ""}")`));
    }
    grid.push(line);
  }
  return toRows(grid, columns);
}
