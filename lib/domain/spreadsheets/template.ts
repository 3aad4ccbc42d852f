import ExcelJS from "exceljs";
import { describeRange, type EntryColumn } from "@/lib/domain/observations/columns";
import { displayValue, type CellValue } from "@/lib/domain/observations/values";
import { MISSING_REASONS } from "@/lib/domain/vocabulary/enums";
import { missingCell, missingWordsList, type MissingReason } from "@/lib/domain/observations/missing";
import { addDays } from "@/lib/domain/schedule";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import type { Locale } from "@/lib/domain/vocabulary/enums";
import { FIXED_HEADINGS, PLOT_SHEET } from "./read";
import { addSheetRow, csvFile, type SheetCell } from "./write";

export interface TemplateInput {
  trialCode: string;
  trialTitle: string;
  siteName: string;
  sownOn: string | null;
  columns: EntryColumn[];
  plots: { id: number; plotCode: string; block: number; blindCode: string }[];
  values: Record<number, Record<string, CellValue>>;
  /** Why a plot has no value, by plot id and column key. */
  missing: Record<number, Record<string, MissingReason>>;
  /** The language of the data dictionary and the cell prompts; the plot sheet's headings stay as stored. */
  locale?: Locale;
}

/**
 * Excel checks each cell as it is typed: a value in range, or text starting with "missing" (the upload then
 * checks the reason word). Custom formulas are relative to the cell they sit on, so `ref` is that cell.
 */
function validationFor(c: EntryColumn, sownOn: string | null, ref: string, t: Translator): ExcelJS.DataValidation | null {
  const hint = { range: describeRange(c, t), words: missingWordsList() };
  const base = { allowBlank: true, showErrorMessage: true, errorStyle: "stop", errorTitle: c.name, error: t("template.enter", hint), showInputMessage: true, promptTitle: c.name, prompt: t("template.prompt", hint) } as const;
  const missing = `LEFT(TRIM(${ref}),7)="missing"`;
  const numeric = (checks: string[]) => ({ ...base, type: "custom" as const, formulae: [`OR(${missing},AND(ISNUMBER(${ref}),${checks.join(",")}))`] });
  switch (c.valueType) {
    case "count":
    case "rating":
      return numeric([`${ref}=INT(${ref})`, `${ref}>=${c.min ?? 0}`, `${ref}<=${c.max ?? 1_000_000}`]);
    case "number":
      return numeric([`${ref}>=${c.min ?? -1_000_000}`, `${ref}<=${c.max ?? 1_000_000}`]);
    case "date": {
      const [y, m, d] = (sownOn ?? "2000-01-02").split("-").map(Number);
      return numeric([`${ref}>=DATE(${y},${m},${d})`]);
    }
    case "yes_no":
      return { ...base, type: "list", formulae: [`"${["yes", "no", ...MISSING_REASONS.map(missingCell)].join(",")}"`] };
    case "text":
      return { ...base, type: "textLength", operator: "lessThanOrEqual", formulae: [1000] };
  }
}

/**
 * The site's data sheet as a workbook: plots in layout order with their blocks and blind codes, one column
 * per value with its unit, Excel data validation, a frozen header and a data dictionary on a second sheet.
 * Values already recorded are filled in, so a corrected sheet can be uploaded again.
 */
export async function buildTemplate(t: TemplateInput): Promise<Buffer> {
  const words = translatorFor(t.locale);
  const wb = new ExcelJS.Workbook();
  wb.creator = "Seedplot";
  const ws = wb.addWorksheet(PLOT_SHEET, { views: [{ state: "frozen", xSplit: 1, ySplit: 1 }] });
  const headings = [...FIXED_HEADINGS, ...t.columns.map((c) => c.heading)];
  addSheetRow(ws, headings);
  ws.getRow(1).font = { bold: true };
  ws.getRow(1).alignment = { wrapText: true, vertical: "top" };
  ws.columns = headings.map((h, i) => ({ width: i < 3 ? 11 : Math.min(32, Math.max(14, h.length * 0.8)) }));
  for (const p of t.plots) {
    const cells: SheetCell[] = [p.plotCode, p.block, p.blindCode];
    for (const c of t.columns) {
      const v = t.values[p.id]?.[c.key] ?? null;
      const reason = t.missing[p.id]?.[c.key];
      if (reason) cells.push(missingCell(reason));
      else if (!v) cells.push(null);
      else if (c.valueType === "date" && v.valueDate) cells.push(new Date(`${v.valueDate}T00:00:00Z`));
      else if (c.valueType === "text" || c.valueType === "yes_no") cells.push(displayValue(c, v));
      else cells.push(v.valueNumber);
    }
    addSheetRow(ws, cells);
  }
  for (let r = 2; r <= t.plots.length + 1; r += 1) {
    t.columns.forEach((c, i) => {
      const cell = ws.getCell(r, FIXED_HEADINGS.length + i + 1);
      const dv = validationFor(c, t.sownOn, cell.address, words);
      if (dv) cell.dataValidation = dv;
      if (c.valueType === "date") cell.numFmt = "yyyy-mm-dd";
    });
  }

  const dict = wb.addWorksheet(words("template.dictionary"), { views: [{ state: "frozen", ySplit: 1 }] });
  addSheetRow(dict, [words("template.colHeading"), words("template.colTrait"), words("template.colUnit"), words("template.colType"), words("template.colValid"), words("template.colDue")]);
  dict.getRow(1).font = { bold: true };
  const fixed = { change: words("template.doNotChange"), text: words("template.text") };
  addSheetRow(dict, ["Plot", words("template.plotWhat"), "", fixed.text, fixed.change, ""]);
  addSheetRow(dict, ["Block", words("template.blockWhat"), "", words("template.wholeNumber"), fixed.change, ""]);
  addSheetRow(dict, ["Code", words("template.codeWhat"), "", fixed.text, fixed.change, ""]);
  for (const c of t.columns) {
    const due = c.dueDay !== null ? (t.sownOn ? words("template.dueDayDate", { day: String(c.dueDay), date: addDays(t.sownOn, c.dueDay) }) : words("template.dueDay", { day: String(c.dueDay) })) : (c.dueNote ?? "");
    addSheetRow(dict, [c.heading, c.name, c.unit ?? "", words("template.type", { type: c.valueType }), describeRange(c, words), due]);
  }
  addSheetRow(dict, []);
  const about = { code: t.trialCode, trial: t.trialTitle, site: t.siteName };
  addSheetRow(dict, [t.sownOn ? words("template.titleSown", { ...about, date: t.sownOn }) : words("template.title", about)]);
  addSheetRow(dict, [words("template.howEmpty")]);
  addSheetRow(dict, [words("template.howMissing", { words: missingWordsList() })]);
  addSheetRow(dict, [words("template.howReplace")]);
  if ((t.locale ?? "en") !== "en") addSheetRow(dict, [words("template.headingsNote")]);
  dict.columns = [{ width: 40 }, { width: 30 }, { width: 14 }, { width: 14 }, { width: 30 }, { width: 34 }];
  return Buffer.from(await wb.xlsx.writeBuffer());
}

/** The recorded values as CSV with the template's columns (written by lib/domain/spreadsheets/write, so safe to open). */
export function buildCsvExport(t: TemplateInput): string {
  const out: SheetCell[][] = [[...FIXED_HEADINGS, ...t.columns.map((c) => c.heading)]];
  for (const p of t.plots) {
    out.push([p.plotCode, p.block, p.blindCode, ...t.columns.map((c) => {
      const v = t.values[p.id]?.[c.key] ?? null;
      const reason = t.missing[p.id]?.[c.key];
      if (reason) return missingCell(reason);
      if (!v) return null;
      return c.valueType === "count" || c.valueType === "number" || c.valueType === "rating" ? v.valueNumber : displayValue(c, v);
    })]);
  }
  return csvFile(out);
}
