import { directionLabel, inStatedOrder, rankedValue } from "@/lib/domain/analysis/ranking";
import ExcelJS from "exceljs";
import { addSheetRow, csvFile, type SheetCell } from "@/lib/domain/spreadsheets/write";
import type { PublicSnapshot } from "./public-shape";

const DATA_COLUMNS = ["site", "block", "plot", "code", "variety", "trait", "unit", "value", "status", "missing reason", "seeds sown", "seedlings emerged"] as const;

const MEANS_COLUMNS = ["trait", "unit", "better when", "scope", "variety", "code", "check", "mean", "SE", "plots", "group", "rank", "% of check", "difference from check", "beyond LSD", "LSD 0.05", "CV %"] as const;

const DICTIONARY: [string, string][] = [
  ["site", "Partner site (farm or garden) where the plot grew."],
  ["block", "Replicate block within the site; every variety appears once per block, in random order."],
  ["plot", "Plot code printed on the plot label: site number, block, position in the block."],
  ["code", "Blind code the growers saw during the trial."],
  ["variety", "Variety name, revealed at publication."],
  ["trait", "What was measured. Dates are given as days from the site's sowing date."],
  ["unit", "Unit of the value; days for dates, counted from the site's sowing date."],
  ["value", "The value analysed for the plot. Empty when the plot is missing."],
  ["status", "used = in the analysis; missing = no value (the reason is in the next column); excluded = left out by the coordinator (the reason is in the report and on the Excel file's Left out sheet)."],
  ["missing reason", "Why a missing plot has no value, as the grower recorded it."],
  ["seeds sown", "Seeds sown in the plot."],
  ["seedlings emerged", "Seedlings counted in the plot at the final emergence count."],
];

const MEANS_DICTIONARY: [string, string][] = [
  ["better when", "Which way is better for the trait; with no preference nothing is ranked."],
  ["mean", "Least-squares mean when plots are missing, otherwise the plain mean."],
  ["group", "Varieties sharing a letter are not clearly different (5% level)."],
  ["rank", "1 = best for the trait's direction; empty when the trait has no preferred direction."],
  ["% of check", "The variety's mean as a percentage of the check variety's (check = 100)."],
  ["difference from check", "The variety's mean minus the check's, in the trait's unit."],
  ["beyond LSD", "yes when that difference is larger than the LSD 0.05; empty without an LSD."],
];

function dataRows(snapshot: PublicSnapshot) {
  return snapshot.data.map((d): SheetCell[] => [d.site, d.block, d.plotCode, d.blindCode, d.variety, d.trait, d.unit, d.value, d.status, d.missingReason ?? "", d.seedsSown, d.emerged]);
}

/** One row per variety and trait: the combined means (or the one site's), in the stated order, with % of check. */
function meanRows(snapshot: PublicSnapshot): SheetCell[][] {
  const rows: SheetCell[][] = [];
  for (const { result } of snapshot.results) {
    const block = result.combined ?? result.perSite.find((p) => p.result)?.result ?? null;
    if (!block) continue;
    const scope = result.combined ? `combined, ${result.combined.sites} sites` : "one site";
    const unit = result.trait.computation !== "none" || result.trait.valueType === "date" ? "days" : result.trait.unit;
    for (const m of inStatedOrder(block.means)) {
      rows.push([
        result.trait.analysedAs,
        unit,
        directionLabel(result.trait.betterWhen).toLowerCase(),
        scope,
        m.varietyName ?? m.blindCode,
        m.blindCode,
        m.isCheck ? "yes" : "",
        rankedValue(m),
        m.se,
        m.n,
        m.letter ?? "",
        m.rank,
        m.percentOfCheck,
        m.checkDifference,
        m.beyondLsd === null ? "" : m.beyondLsd ? "yes" : "no",
        block.lsd,
        block.cv,
      ]);
    }
  }
  return rows;
}

/** The published plot data as CSV, with the citation as a comment-style first line. */
export function publishedCsv(snapshot: PublicSnapshot): string {
  return csvFile([[`# ${snapshot.citation}`], [...DATA_COLUMNS], ...dataRows(snapshot)]);
}

/** The published means (one row per variety and trait, with % of check) as CSV. */
export function publishedMeansCsv(snapshot: PublicSnapshot): string {
  return csvFile([[`# ${snapshot.citation}`], [...MEANS_COLUMNS], ...meanRows(snapshot)]);
}

/** The published data as a workbook: plot data, means, a data dictionary and how to cite it. */
export async function publishedXlsx(snapshot: PublicSnapshot): Promise<Buffer> {
  const book = new ExcelJS.Workbook();
  book.creator = "Seedplot";
  book.created = new Date(snapshot.publishedAt);

  const data = book.addWorksheet("Plot data", { views: [{ state: "frozen", ySplit: 1 }] });
  addSheetRow(data, [...DATA_COLUMNS]).font = { bold: true };
  for (const row of dataRows(snapshot)) addSheetRow(data, row);

  const means = book.addWorksheet("Means", { views: [{ state: "frozen", ySplit: 1 }] });
  addSheetRow(means, [...MEANS_COLUMNS]).font = { bold: true };
  for (const row of meanRows(snapshot)) addSheetRow(means, row);

  // Exactly what each trait leaves out, with the public reason; sites not in this version at all come last.
  const leftOut = book.addWorksheet("Left out");
  addSheetRow(leftOut, ["trait", "site", "plot", "reason"]).font = { bold: true };
  for (const { result } of snapshot.results) {
    for (const x of result.exclusions) addSheetRow(leftOut, [result.trait.analysedAs, x.siteName ?? "", x.plotCode ?? "whole site", x.reason]);
  }
  for (const s of snapshot.coverage.notIncluded) addSheetRow(leftOut, ["every trait", s.name, "whole site", `not included: ${s.reason}`]);

  const dictionary = book.addWorksheet("Data dictionary");
  addSheetRow(dictionary, ["column", "meaning"]).font = { bold: true };
  for (const row of [...DICTIONARY, ...MEANS_DICTIONARY]) addSheetRow(dictionary, row);
  addSheetRow(dictionary, []);
  addSheetRow(dictionary, ["trait", "definition"]).font = { bold: true };
  for (const t of snapshot.traits) addSheetRow(dictionary, [t.analysedAs, t.description ?? ""]);
  addSheetRow(dictionary, []);
  addSheetRow(dictionary, ["settings", `sites ${snapshot.settings.siteModel}; mean separation ${snapshot.settings.separation === "lsd" ? "protected LSD" : "Tukey HSD"}; alpha 0.05; accepted data only`]);

  const cite = book.addWorksheet("How to cite");
  addSheetRow(cite, [snapshot.citation]);
  addSheetRow(cite, [`Version ${snapshot.version}, published ${snapshot.publishedAt.slice(0, 10)}.`]);
  if (snapshot.changeNote) addSheetRow(cite, [`What changed: ${snapshot.changeNote}`]);
  for (const sheet of [data, means, dictionary, cite]) sheet.columns.forEach((c) => (c.width = 22));
  return Buffer.from(await book.xlsx.writeBuffer());
}
