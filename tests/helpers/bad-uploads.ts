import ExcelJS from "exceljs";
import * as CFB from "cfb";
import { strFromU8, strToU8, unzipSync, zipSync } from "fflate";

// The generated corpus of hostile and sloppy uploads: every variant is made here from the site's real template
// (xlsx) or its CSV export, with the judgement it must get and what the grower must be told. The files can be
// regenerated and inspected (tests/output/bad-uploads); nothing binary is committed.

export interface CorpusContext {
  /** The site's .xlsx template as downloaded. */
  template: Uint8Array;
  /** The site's CSV export as cells, heading first. */
  grid: string[][];
  /** A plot of another grower's site. */
  foreignPlotCode: string;
  /** 1-based column of a value key (as in a sheet). */
  columnOf: (key: string) => number;
}

export interface UploadVariant {
  /** The rule the variant protects: the test's name. */
  rule: string;
  /** The name the file is uploaded under (its content, not its name, decides how it is read). */
  name: string;
  /**
   * "refused": the whole file is refused before any row is read; "rows": read, but rows have problems;
   * "accepted": read without problems (the preview writes nothing; saving would).
   */
  judgement: "refused" | "rows" | "accepted";
  /**
   * What the grower must be told: matched against the refusal, against the problems as the page lists them
   * ("Row 5, column F (…): message"), or for an accepted file against
   * `sheet <read or none>; not read <other sheets>; new <heading> = <value>, …`.
   */
  expect: (c: CorpusContext) => RegExp;
  /** Text the message must not contain. */
  never?: RegExp;
  build: (c: CorpusContext) => Uint8Array | Promise<Uint8Array>;
}

const enc = (s: string) => new TextEncoder().encode(s);

async function editWorkbook(template: Uint8Array, edit: (ws: ExcelJS.Worksheet, wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(template as unknown as ArrayBuffer);
  edit(wb.getWorksheet("Plots")!, wb);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

/** Adds a worksheet in front of the others, as a grower's own table often is. */
function sheetFirst(wb: ExcelJS.Workbook, name: string, rows: unknown[][]): ExcelJS.Worksheet {
  const ws = wb.addWorksheet(name);
  // exceljs orders sheets by this number; it is not in its typings.
  (ws as unknown as { orderNo: number }).orderNo = -1;
  for (const r of rows) ws.addRow(r);
  return ws;
}

/** CSV of the grid with cells replaced (1-based row and column as in a sheet). */
function csvFrom(grid: string[][], edits: [number, number, string][] = [], sep = ","): string {
  const copy = grid.map((r) => [...r]);
  for (const [r, c, v] of edits) copy[r - 1]![c - 1] = v;
  const quote = new RegExp(`["\\n${sep === "," ? "," : ";"}]`);
  return copy.map((r) => r.map((v) => (quote.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(sep)).join("\n");
}

/**
 * The template turned into a macro-enabled workbook the way Excel saves one: the main part declared
 * macro-enabled and a VBA project part (its bytes do not matter here, it is never run).
 */
function withMacros(template: Uint8Array): Uint8Array {
  const parts = unzipSync(template);
  const types = strFromU8(parts["[Content_Types].xml"]!)
    .replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml", "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
    .replace("</Types>", '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"/></Types>');
  parts["[Content_Types].xml"] = strToU8(types);
  parts["xl/_rels/workbook.xml.rels"] = strToU8(
    strFromU8(parts["xl/_rels/workbook.xml.rels"]!).replace("</Relationships>", '<Relationship Id="rIdVba" Type="http://schemas.microsoft.com/office/2006/relationships/vbaProject" Target="vbaProject.bin"/></Relationships>'),
  );
  parts["xl/vbaProject.bin"] = compoundFile({ "VBA/dir": new Uint8Array(16), PROJECT: enc('ID="{00000000-0000-0000-0000-000000000000}"\r\n') });
  return zipSync(parts);
}

/** A compound (OLE) file, the container of old .xls files and of password-protected Office files. */
function compoundFile(streams: Record<string, Uint8Array>): Uint8Array<ArrayBuffer> {
  const cfb = CFB.utils.cfb_new();
  for (const [name, bytes] of Object.entries(streams)) CFB.utils.cfb_add(cfb, name, Buffer.from(bytes));
  return Uint8Array.from(CFB.write(cfb, { type: "buffer" }) as Buffer);
}

/** BIFF8 records (MS-XLS 2.1.4): type and length, little-endian, then the data. */
function biff(records: [number, number[]][]): Uint8Array {
  return new Uint8Array(records.flatMap(([type, data]) => [type & 0xff, type >> 8, data.length & 0xff, data.length >> 8, ...data]));
}
const BOF = [0x0809, [0x00, 0x06, 0x05, 0x00, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0]] as [number, number[]];
const EOF = [0x000a, []] as [number, number[]];

/**
 * What Office writes when a workbook is saved with a password: a compound file with an EncryptionInfo stream
 * (version 4.4, agile encryption, followed by its XML descriptor) and the encrypted package (MS-OFFCRYPTO 2.3.4.10).
 */
function passwordProtected(): Uint8Array {
  const info = new Uint8Array([0x04, 0x00, 0x04, 0x00, 0x40, 0x00, 0x00, 0x00, ...enc('<?xml version="1.0" encoding="UTF-8" standalone="yes"?><encryption xmlns="http://schemas.microsoft.com/office/2006/encryption"/>')]);
  const packageBytes = new Uint8Array(4096).map((_, i) => (i * 97 + 13) & 0xff);
  return compoundFile({ EncryptionInfo: info, EncryptedPackage: packageBytes, "\u0006DataSpaces/Version": new Uint8Array(76) });
}

/** The template with one row's last fields cut off, as a line broken by hand in a text editor. */
function shortLine(grid: string[][], row: number, drop: number): string {
  const lines = csvFrom(grid).split("\n");
  lines[row - 1] = lines[row - 1]!.split(",").slice(0, -drop).join(",");
  return lines.join("\n");
}

export const UPLOAD_CORPUS: UploadVariant[] = [
  // What the file is: decided by its bytes.
  { rule: "a PDF is refused as a PDF", name: "report.pdf", judgement: "refused", expect: () => /is a PDF\. Upload the Excel template \(\.xlsx\) or a CSV file/, build: () => enc("%PDF-1.7\n%fake\n") },
  { rule: "a picture renamed .xlsx is refused as a picture", name: "photo-renamed.xlsx", judgement: "refused", expect: () => /named \.xlsx but is a PNG picture/, build: () => new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3]) },
  { rule: "a program renamed .csv is refused as a program", name: "program-renamed.csv", judgement: "refused", expect: () => /named \.csv but is a Windows program/, build: () => new Uint8Array([0x4d, 0x5a, 0x90, 0, 3, 0, 0, 0]) },
  {
    rule: "an old Excel 97-2003 workbook is refused as an old .xls, whatever its name",
    name: "old-excel.xlsx",
    judgement: "refused",
    expect: () => /named \.xlsx but is an old-style Excel 97-2003 \(\.xls\) workbook\. Open it in your spreadsheet program and save it as an Excel Workbook \(\.xlsx\)/,
    build: () => compoundFile({ Workbook: biff([BOF, EOF]) }),
  },
  { rule: "a damaged old-style Office file is refused as damaged", name: "broken-old.xls", judgement: "refused", expect: () => /old-style Office file .*damaged or cannot be read/, build: () => new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0]) },
  {
    rule: "a password-protected workbook is refused as password-protected, not as an old .xls",
    name: "protected.xlsx",
    judgement: "refused",
    expect: () => /protected with a password.*save a copy without the password.*upload that copy/,
    never: /97-2003|\.xls\)/,
    build: passwordProtected,
  },
  {
    rule: "a password-protected Excel 97-2003 workbook is refused as password-protected",
    name: "protected-old.xls",
    judgement: "refused",
    expect: () => /protected with a password/,
    never: /97-2003/,
    build: () => compoundFile({ Workbook: biff([BOF, [0x002f, [0x01, 0x00, ...new Array<number>(52).fill(7)]], EOF]) }),
  },
  {
    rule: "a macro-enabled workbook renamed .xlsx is refused for its macros",
    name: "macros-renamed.xlsx",
    judgement: "refused",
    expect: () => /contains macros \(it is a macro-enabled workbook, whatever its name says\).*Save As → Excel Workbook \(\.xlsx\)/,
    build: (c) => withMacros(c.template),
  },
  { rule: "a macro-enabled workbook named .xlsm gets the same refusal as renamed", name: "macros.xlsm", judgement: "refused", expect: () => /contains macros \(it is a macro-enabled workbook/, build: (c) => withMacros(c.template) },
  {
    rule: "a workbook declaring a macro-enabled main part is refused even without a VBA part",
    name: "macro-type.xlsx",
    judgement: "refused",
    expect: () => /contains macros/,
    build: (c) => {
      const parts = unzipSync(c.template);
      parts["[Content_Types].xml"] = strToU8(strFromU8(parts["[Content_Types].xml"]!).replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml", "application/vnd.ms-excel.sheet.macroEnabled.main+xml"));
      return zipSync(parts);
    },
  },
  { rule: "a workbook is read as a workbook whatever its name", name: "workbook-renamed.csv", judgement: "accepted", expect: () => /^sheet Plots; not read Data dictionary; new $/, build: (c) => c.template },
  { rule: "a web page saved as .xls is refused as a web page", name: "export.xls", judgement: "refused", expect: () => /named \.xls but is a web page \(HTML\)/, build: () => enc("<!DOCTYPE html><html><body><table><tr><td>Plot</td></tr></table></body></html>") },
  { rule: "an empty file is refused as empty", name: "empty.csv", judgement: "refused", expect: () => /The file is empty/, build: () => new Uint8Array() },
  { rule: "a file over the size limit is refused", name: "too-big.csv", judgement: "refused", expect: () => /the limit is 5 MB/, build: (c) => enc(`${c.grid[0]!.join(",")}\n${"x,1,A\n".repeat(1_000_000)}`) },
  {
    rule: "a zip bomb is refused before it is unpacked",
    name: "zip-bomb.xlsx",
    judgement: "refused",
    expect: () => /zip bomb/,
    build: () => zipSync({ "[Content_Types].xml": enc("<Types/>"), "xl/workbook.xml": enc("<workbook/>"), "xl/worksheets/sheet1.xml": new Uint8Array(80 * 1024 * 1024) }, { level: 9 }),
  },
  { rule: "a zip that is not a workbook is refused", name: "plain-zip.xlsx", judgement: "refused", expect: () => /zip file but not an Excel workbook/, build: () => zipSync({ "notes.txt": enc("hello") }) },
  {
    rule: "a CSV not in UTF-8 is refused",
    name: "latin1.csv",
    judgement: "refused",
    expect: () => /not in UTF-8/,
    build: (c) => new Uint8Array([...enc(csvFrom(c.grid)), 0x0a, ...enc("S01-1-01,1,X,"), 0xe9, 0x0a]),
  },

  // The layout of the sheet.
  {
    rule: "a formula in a workbook is refused naming the sheet, row and column",
    name: "formula.xlsx",
    judgement: "refused",
    expect: () => /^Sheet "Plots": Row 3, column [A-Z]+ \("Overall quality \[1-9\]"\) holds a formula/,
    build: (c) =>
      editWorkbook(c.template, (ws) => {
        ws.getCell(3, c.columnOf("quality")).value = { formula: "2+3", result: 5 } as ExcelJS.CellFormulaValue;
      }),
  },
  { rule: "merged cells are refused", name: "merged.xlsx", judgement: "refused", expect: () => /Sheet "Plots": The sheet has merged cells/, build: (c) => editWorkbook(c.template, (ws) => ws.mergeCells(2, c.columnOf("quality"), 3, c.columnOf("quality"))) },
  {
    rule: "an extra column is refused by its heading",
    name: "extra-column.xlsx",
    judgement: "refused",
    expect: () => /"Weather" is not one of this trial's columns/,
    build: (c) =>
      editWorkbook(c.template, (ws) => {
        ws.getCell(1, c.grid[0]!.length + 1).value = "Weather";
      }),
  },
  { rule: "a missing column is refused by its heading", name: "missing-column.csv", judgement: "refused", expect: () => /The column "Overall quality \[1-9\]" is missing/, build: (c) => enc(csvFrom(c.grid.map((r) => r.filter((_, i) => i !== c.columnOf("quality") - 1)))) },
  { rule: "a renamed column is refused naming both headings", name: "renamed-column.csv", judgement: "refused", expect: () => /"Yield \(g\)" is not one of this trial's columns.*"Marketable yield \[g per plot\]" is missing/, build: (c) => enc(csvFrom(c.grid, [[1, c.columnOf("marketable_yield"), "Yield (g)"]])) },
  { rule: "a CSV cell starting with = is refused", name: "formula-text.csv", judgement: "refused", expect: () => /Row 4, column [A-Z]+ .* starts with "="/, build: (c) => enc(csvFrom(c.grid, [[4, c.columnOf("quality"), "=1+1"]])) },
  {
    rule: "a CSV without its heading row is refused once, saying row 1 must hold the headings",
    name: "no-heading-row.csv",
    judgement: "refused",
    expect: (c) => new RegExp(`^Row 1 must hold the column headings from the template .*but it holds "${c.grid[1]![0]}", .*the heading row seems to be missing\\. Copy row 1 from a fresh template`),
    never: /is not one of this trial's columns|is missing\. Download/,
    build: (c) => enc(csvFrom(c.grid.slice(1))),
  },
  {
    rule: "a workbook without its heading row is refused once, naming the sheet and row 1",
    name: "no-heading-row.xlsx",
    judgement: "refused",
    expect: () => /^Sheet "Plots": Row 1 must hold the column headings from the template.*heading row seems to be missing/,
    never: /is not one of this trial's columns/,
    build: (c) => editWorkbook(c.template, (ws) => ws.spliceRows(1, 1)),
  },
  { rule: "headings moved below row 1 are refused naming their row", name: "title-above.csv", judgement: "refused", expect: () => /The column headings are on row 3, but they must be on row 1\. Delete the rows above them \(rows 1 to 2\)/, build: (c) => enc(csvFrom([["Willow Bend kale"], [""], ...c.grid])) },
  {
    rule: "a CSV line with fewer fields than the heading line is refused naming the line and the fields it lacks",
    name: "short-line.csv",
    judgement: "refused",
    expect: (c) => {
      const h = c.grid[0]!;
      const esc = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
      return new RegExp(`^Line 5 has ${h.length - 2} of the ${h.length} fields, so it has no place for ${esc(h.at(-2)!)} \\(column [A-Z]+\\) and ${esc(h.at(-1)!)} \\(column [A-Z]+\\)\\.`);
    },
    build: (c) => enc(shortLine(c.grid, 5, 2)),
  },
  {
    rule: "a value far below the plots is refused naming its cell",
    name: "stray-far-below.xlsx",
    judgement: "refused",
    expect: () => /^Sheet "Plots": There is a value in cell D1048576, far below the plots \(the rows above it end at row \d+\)\. Delete it/,
    never: /1048575 rows/,
    build: (c) =>
      editWorkbook(c.template, (ws) => {
        ws.getCell(1048576, 4).value = 7;
      }),
  },
  {
    rule: "a value far below the plots in a CSV is refused naming its cell",
    name: "stray-far-below.csv",
    judgement: "refused",
    expect: (c) => new RegExp(`^There is a value in cell E${c.grid.length + 300}, far below the plots \\(the rows above it end at row ${c.grid.length}\\)`),
    build: (c) => enc(`${csvFrom(c.grid)}${"\n".repeat(300)},,,,12\n`),
  },
  {
    rule: "a workbook whose first sheet is another table is read from its plot sheet, saying which",
    name: "notes-first.xlsx",
    judgement: "accepted",
    expect: () => /^sheet Plots; not read Weather, Data dictionary; new Overall quality \[1-9\] = 6$/,
    build: (c) =>
      editWorkbook(c.template, (ws, wb) => {
        sheetFirst(wb, "Weather", [["Date", "Rain (mm)", "Frost"], [new Date("2026-11-20T00:00:00Z"), 4, "no"], [new Date("2026-11-21T00:00:00Z"), 0, "yes"]]);
        ws.getCell(2, c.columnOf("quality")).value = 6;
      }),
  },
  {
    rule: "a plot sheet under another name is found and named",
    name: "renamed-sheet.xlsx",
    judgement: "accepted",
    expect: () => /^sheet Willow kale; not read Weather, Data dictionary; new Overall quality \[1-9\] = 6$/,
    build: (c) =>
      editWorkbook(c.template, (ws, wb) => {
        ws.name = "Willow kale";
        sheetFirst(wb, "Weather", [["Date", "Rain (mm)"], [new Date("2026-11-20T00:00:00Z"), 4]]);
        ws.getCell(2, c.columnOf("quality")).value = 6;
      }),
  },
  {
    rule: "a workbook with two sheets that could hold the plots is refused naming both",
    name: "two-tables.xlsx",
    judgement: "refused",
    expect: () => /^Sheets "Summary" and "Plots" could each hold the plot values, so we cannot tell which one to save\. Keep only the sheet you want saved/,
    build: (c) =>
      editWorkbook(c.template, (ws, wb) => {
        sheetFirst(wb, "Summary", [["Plot", "Yield"], [c.grid[1]![0], 120], [c.grid[2]![0], 95]]);
        ws.getCell(2, c.columnOf("quality")).value = 6;
      }),
  },
  {
    rule: "a hidden copy of the plot sheet is named as hidden",
    name: "hidden-copy.xlsx",
    judgement: "refused",
    expect: () => /^Sheets "Plots" and "Plots \(2\)" \(a hidden sheet\) could each hold the plot values/,
    build: (c) =>
      editWorkbook(c.template, (_ws, wb) => {
        const copy = wb.addWorksheet("Plots (2)", { state: "hidden" });
        for (const r of c.grid) copy.addRow(r);
      }),
  },
  {
    rule: "an unfilled template is refused saying it has no values yet and what to fill in",
    name: "unfilled.xlsx",
    judgement: "refused",
    expect: () => /^This sheet has no values in it yet: every value cell is empty\. Type what you have measured in each plot's row \((due by now:|for example) .+ in column [A-Z]+.*\), leave a cell empty for anything not measured yet/,
    never: /nothing to save/i,
    build: (c) =>
      editWorkbook(c.template, (ws) => {
        for (let r = 2; r <= c.grid.length; r += 1) for (let col = 4; col <= c.grid[0]!.length; col += 1) ws.getCell(r, col).value = null;
      }),
  },

  // Values, rows and plots.
  { rule: "a date that could be read two ways is refused with both readings", name: "ambiguous-date.csv", judgement: "rows", expect: () => /could be 1 December 2026 or 12 January 2026/, build: (c) => enc(csvFrom(c.grid, [[2, c.columnOf("harvest_date"), "01/12/2026"]])) },
  { rule: "text in a number column is refused", name: "text-in-number.csv", judgement: "rows", expect: () => /"about 200" is not a number/, build: (c) => enc(csvFrom(c.grid, [[5, c.columnOf("marketable_yield"), "about 200"]])) },
  { rule: "a comma before three digits in a CSV is asked about", name: "thousands-or-decimal.csv", judgement: "rows", expect: () => /could mean 1250 or 1\.250/, build: (c) => enc(csvFrom(c.grid, [[5, c.columnOf("marketable_yield"), "1,250"]])) },
  {
    rule: "a number typed as text with a comma in a workbook is asked about, naming the cell",
    name: "text-comma-number.xlsx",
    judgement: "rows",
    expect: () => /^Row 5, column [A-Z]+ \(Marketable yield \[g per plot\]\): "12873,5" is stored in this cell as text, not as a number.*decimals \(12873\.5\) or separate thousands/,
    build: (c) =>
      editWorkbook(c.template, (ws) => {
        ws.getCell(5, c.columnOf("marketable_yield")).value = "12873,5";
      }),
  },
  {
    rule: "a CSV separated by semicolons keeps its decimal commas",
    name: "semicolons.csv",
    judgement: "accepted",
    expect: () => /^sheet none; not read ; new Marketable yield \[g per plot\] = 12873\.5$/,
    build: (c) => enc(csvFrom(c.grid, [[5, c.columnOf("marketable_yield"), "12873,5"]], ";")),
  },
  { rule: "a rating out of range is refused", name: "rating-out-of-range.csv", judgement: "rows", expect: () => /Ratings are whole numbers from 1 to 9/, build: (c) => enc(csvFrom(c.grid, [[6, c.columnOf("quality"), "11"]])) },
  { rule: "more seedlings than seeds is refused", name: "emerged-over-sown.csv", judgement: "rows", expect: () => /more than the 6 seeds sown/, build: (c) => enc(csvFrom(c.grid, [[7, c.columnOf("emergence_count@5"), "9"]])) },
  {
    rule: "a plot on two rows with the same values names both rows",
    name: "duplicate-plot.csv",
    judgement: "rows",
    expect: (c) => new RegExp(`Plot ${c.grid[3]![0]} is on row 4 and again on row ${c.grid.length + 1}, with the same values\\. Delete one of the two rows`),
    build: (c) => enc(csvFrom([...c.grid, c.grid[3]!])),
  },
  {
    rule: "a plot on two rows that disagree names both rows and the columns that differ",
    name: "conflicting-duplicate.csv",
    judgement: "rows",
    expect: (c) =>
      new RegExp(
        `Plot ${c.grid[3]![0]} is on row 4 and again on row ${c.grid.length + 1}, and the two rows disagree in column [A-Z]+ \\(Marketable yield \\[g per plot\\]: "150" on row 4, "180" on row ${c.grid.length + 1}\\) and column [A-Z]+ \\(Overall quality \\[1-9\\]: empty on row 4, "7" on row ${c.grid.length + 1}\\)\\. Keep the row with the right values`,
      ),
    build: (c) => {
      const first = [...c.grid[3]!];
      first[c.columnOf("marketable_yield") - 1] = "150";
      const again = [...first];
      again[c.columnOf("marketable_yield") - 1] = "180";
      again[c.columnOf("quality") - 1] = "7";
      const grid = c.grid.map((r) => [...r]);
      grid[3] = first;
      return enc(csvFrom([...grid, again]));
    },
  },
  {
    rule: "a value just below the plots with no plot id names its cell",
    name: "stray-near.csv",
    judgement: "rows",
    expect: (c) => new RegExp(`^Row ${c.grid.length + 2}, column A \\(Plot\\): This row has no plot id in cell A${c.grid.length + 2}, but it holds a value in cell [A-Z]+${c.grid.length + 2}\\.`),
    build: (c) => enc(`${csvFrom(c.grid)}\n\n${c.grid[0]!.map((_, i) => (i === 5 ? "total 4512" : "")).join(",")}\n`),
  },
  { rule: "another grower's plot is refused", name: "foreign-plot.csv", judgement: "rows", expect: (c) => new RegExp(`Plot "${c.foreignPlotCode}" is not one of this site's plots`), build: (c) => enc(csvFrom(c.grid, [[8, 1, c.foreignPlotCode]])) },
  { rule: "a row whose code no longer matches its plot is refused", name: "shifted-rows.csv", judgement: "rows", expect: () => /has code .* but this row says ZZZ/, build: (c) => enc(csvFrom(c.grid, [[9, 3, "ZZZ"]])) },
];
