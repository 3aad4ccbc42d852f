import ExcelJS from "exceljs";
import { zipSync } from "fflate";

// Builds the hostile and sloppy uploads the spreadsheet tests refuse: each file is made here from a real
// template, so the folder can be regenerated and inspected (tests/output/bad-uploads).

export interface BadUpload {
  name: string;
  bytes: Uint8Array;
  /** What the grower must be told. */
  expect: RegExp;
  /** "file": refused before reading rows; "rows": read, but rows have problems. */
  level: "file" | "rows";
}

const enc = (s: string) => new TextEncoder().encode(s);

async function editWorkbook(template: Uint8Array, edit: (ws: ExcelJS.Worksheet) => void): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(template as unknown as ArrayBuffer);
  edit(wb.getWorksheet("Plots")!);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

/** CSV of the template's header and rows with one cell replaced (1-based row and column as in a sheet). */
function csvFrom(grid: string[][], edits: [number, number, string][] = []): string {
  const copy = grid.map((r) => [...r]);
  for (const [r, c, v] of edits) copy[r - 1]![c - 1] = v;
  return copy.map((r) => r.map((v) => (/[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(",")).join("\n");
}

export async function buildBadUploads(p: { template: Uint8Array; grid: string[][]; foreignPlotCode: string; columnOf: (key: string) => number }): Promise<BadUpload[]> {
  const { template, grid } = p;
  const qualityCol = p.columnOf("quality");
  const yieldCol = p.columnOf("marketable_yield");
  const harvestCol = p.columnOf("harvest_date");
  const day5Col = p.columnOf("emergence_count@5");
  const files: BadUpload[] = [
    { name: "report.pdf", bytes: enc("%PDF-1.7\n%fake\n"), expect: /Upload the Excel template \(\.xlsx\) or a CSV file/, level: "file" },
    { name: "photo-renamed.xlsx", bytes: new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3]), expect: /named \.xlsx but is a PNG picture/, level: "file" },
    { name: "program-renamed.csv", bytes: new Uint8Array([0x4d, 0x5a, 0x90, 0, 3, 0, 0, 0]), expect: /named \.csv but is a Windows program/, level: "file" },
    { name: "old-excel.xlsx", bytes: new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0]), expect: /Excel 97-2003 \(\.xls\)/, level: "file" },
    { name: "empty.csv", bytes: new Uint8Array(), expect: /The file is empty/, level: "file" },
    { name: "too-big.csv", bytes: enc(`${grid[0]!.join(",")}\n${"x,1,A\n".repeat(1_000_000)}`), expect: /the limit is 5 MB/, level: "file" },
    { name: "zip-bomb.xlsx", bytes: zipSync({ "[Content_Types].xml": enc("<Types/>"), "xl/workbook.xml": enc("<workbook/>"), "xl/worksheets/sheet1.xml": new Uint8Array(80 * 1024 * 1024) }, { level: 9 }), expect: /zip bomb/, level: "file" },
    { name: "plain-zip.xlsx", bytes: zipSync({ "notes.txt": enc("hello") }), expect: /zip file but not an Excel workbook/, level: "file" },
    { name: "workbook-renamed.csv", bytes: template, expect: /named \.csv but is really an Excel workbook/, level: "file" },
    { name: "latin1.csv", bytes: new Uint8Array([...enc(csvFrom(grid)), 0x0a, ...enc("S01-1-01,1,X,"), 0xe9, 0x0a]), expect: /not in UTF-8/, level: "file" },
    {
      name: "formula.xlsx",
      bytes: await editWorkbook(template, (ws) => {
        ws.getCell(3, qualityCol).value = { formula: "2+3", result: 5 } as ExcelJS.CellFormulaValue;
      }),
      expect: /Row 3, column [A-Z]+ \("Overall quality \[1-9\]"\) holds a formula/,
      level: "file",
    },
    {
      name: "merged.xlsx",
      bytes: await editWorkbook(template, (ws) => ws.mergeCells(2, qualityCol, 3, qualityCol)),
      expect: /merged cells/,
      level: "file",
    },
    {
      name: "extra-column.xlsx",
      bytes: await editWorkbook(template, (ws) => {
        ws.getCell(1, grid[0]!.length + 1).value = "Weather";
      }),
      expect: /"Weather" is not one of this trial's columns/,
      level: "file",
    },
    { name: "missing-column.csv", bytes: enc(csvFrom(grid.map((r) => r.filter((_, i) => i !== qualityCol - 1)))), expect: /The column "Overall quality \[1-9\]" is missing/, level: "file" },
    { name: "renamed-column.csv", bytes: enc(csvFrom(grid, [[1, yieldCol, "Yield (g)"]])), expect: /"Yield \(g\)" is not one of this trial's columns.*"Marketable yield \[g per plot\]" is missing/, level: "file" },
    { name: "formula-text.csv", bytes: enc(csvFrom(grid, [[4, qualityCol, "=1+1"]])), expect: /Row 4, column [A-Z]+ .* starts with "="/, level: "file" },
    { name: "ambiguous-date.csv", bytes: enc(csvFrom(grid, [[2, harvestCol, "01/12/2026"]])), expect: /could be 1 December 2026 or 12 January 2026/, level: "rows" },
    { name: "text-in-number.csv", bytes: enc(csvFrom(grid, [[5, yieldCol, "about 200"]])), expect: /"about 200" is not a number/, level: "rows" },
    { name: "thousands-or-decimal.csv", bytes: enc(csvFrom(grid, [[5, yieldCol, "1,250"]])), expect: /could mean 1250 or 1\.250/, level: "rows" },
    { name: "rating-out-of-range.csv", bytes: enc(csvFrom(grid, [[6, qualityCol, "11"]])), expect: /Ratings are whole numbers from 1 to 9/, level: "rows" },
    { name: "emerged-over-sown.csv", bytes: enc(csvFrom(grid, [[7, day5Col, "9"]])), expect: /more than the 6 seeds sown/, level: "rows" },
    { name: "duplicate-plot.csv", bytes: enc(csvFrom([...grid, grid[3]!])), expect: new RegExp(`Plot ${grid[3]![0]} is also on row 4`), level: "rows" },
    { name: "foreign-plot.csv", bytes: enc(csvFrom(grid, [[8, 1, p.foreignPlotCode]])), expect: new RegExp(`Plot "${p.foreignPlotCode}" is not one of this site's plots`), level: "rows" },
    { name: "shifted-rows.csv", bytes: enc(csvFrom(grid, [[9, 3, "ZZZ"]])), expect: /has code .* but this row says ZZZ/, level: "rows" },
  ];
  return files;
}
