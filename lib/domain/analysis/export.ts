/**
 * The analysis as plain tables for spreadsheets and CSV: the same result DTO the page shows, so the
 * numbers cannot drift apart. lib/domain/spreadsheets/write turns them into files and makes every cell safe.
 */
import { inStatedOrder, orderWords } from "./ranking";
import { ANOVA_SOURCE_LABELS } from "@/lib/domain/vocabulary/labels";
import type { AnalysisResult } from "./types";
import { mixedExportTables } from "./mixed-export";

export type Cell = string | number | boolean | null;
export interface ExportTable {
  name: string;
  columns: string[];
  rows: Cell[][];
}

/** Every table of the export, in sheet order. `generatedAt` is passed in so this stays pure. */
export function exportTables(result: AnalysisResult, generatedAt: string, withNames: boolean): ExportTable[] {
  const name = (e: { varietyName: string | null }) => (withNames ? e.varietyName : null);
  const s = result.settings;
  const settings: ExportTable = {
    name: "Settings",
    columns: ["Setting", "Value"],
    rows: [
      ["Trial", `${result.trial.code} ${result.trial.title}`],
      ["Crop", result.trial.crop],
      ["Trait", result.trait.name],
      ["Analysed as", result.trait.analysedAs],
      ["Order", `${orderWords(result.trait)}${result.trait.betterWhen === "neither" ? "; not ranked" : ""}`],
      ["Sites", s.siteModel === "random" ? `random (varieties tested against ${ANOVA_SOURCE_LABELS["entry:site"]})` : "fixed (entries tested against pooled error)"],
      ["Mean comparison", s.separation === "lsd" ? "protected LSD, alpha 0.05" : "Tukey HSD, alpha 0.05"],
      ["Data used", s.includeUnaccepted ? "accepted and not yet accepted" : "accepted only"],
      ...result.sites.map((site): Cell[] => [`Site: ${site.name}`, site.included ? `included (${site.status})` : `left out: ${site.why}`]),
      // A file travels beyond the portal, so it carries the public reason and never the staff's note.
      ...result.exclusions.map((x): Cell[] => [`Left out`, `${x.plotCode ? `plot ${x.plotCode} (${x.siteName})` : `whole site ${x.siteName}`}, ${x.traitName ?? "all traits"}: ${x.publicReason} (${x.createdBy ?? "unknown"}, ${x.createdAt.slice(0, 10)})`]),
      ["Generated", generatedAt],
    ],
  };
  const raw: ExportTable = {
    name: "Raw data",
    columns: ["Plot", "Site", "Block", "Entry code", "Variety", "Value", "Status"],
    rows: result.plots.map((p) => [p.plotCode, p.siteName, p.block, p.blindCode, name(p), p.value, p.status]),
  };
  const scopes = [
    ...(result.combined ? [{ scope: "All sites", block: result.combined }] : []),
    ...result.perSite.filter((x) => x.result).map((x) => ({ scope: x.siteName, block: x.result! })),
  ];
  const means: ExportTable = {
    name: "Means",
    columns: ["Scope", "Entry code", "Variety", "Check", "Mean", "LS mean", "SE", "Plots", "Group", "Rank", "% of check", "Difference from check", "Beyond LSD", "LSD 0.05", "CV %"],
    rows: scopes.flatMap(({ scope, block }) =>
      inStatedOrder(block.means).map((m): Cell[] => [scope, m.blindCode, name(m), m.isCheck, m.mean, m.lsMean, m.se, m.n, m.letter, m.rank, m.percentOfCheck, m.checkDifference, m.beyondLsd, block.lsd, block.cv]),
    ),
  };
  const anova: ExportTable = {
    name: "ANOVA",
    columns: ["Scope", "Source", "df", "Sum of squares", "Mean square", "F", "p", "Tested against"],
    rows: scopes.flatMap(({ scope, block }) =>
      block.rows.map((r): Cell[] => [scope, ANOVA_SOURCE_LABELS[r.source], r.df, r.ss, r.ms, r.f, r.p, r.testedAgainst ? ANOVA_SOURCE_LABELS[r.testedAgainst] : null]),
    ),
  };
  const tables = [settings, raw, means, anova];
  if (result.germination) {
    tables.push({
      name: "Emergence",
      columns: ["Site", "Entry code", "Variety", "Seeds sown", "Emerged", "Emergence %", "95% lower", "95% upper"],
      rows: [...result.germination.byEntry, ...result.germination.bySite].map((g) => [g.siteName ?? "All sites", g.blindCode, name(g), g.sown, g.emerged, g.percent, g.lower, g.upper]),
    });
  }
  const stability = result.combined?.stability;
  if (stability) {
    tables.push({
      name: "Stability",
      columns: ["Entry code", "Variety", "Check", "Mean of site means", "Slope on site mean", "Slope SE", "Slope p (vs 1)", "Deviation MS", "Deviation p", "Ecovalence", "Shukla variance", "Reading"],
      rows: stability.rows.map((r): Cell[] => [r.blindCode, name(r), r.isCheck, r.mean, r.slope, r.slopeSe, r.slopeP, r.deviationMs, r.deviationP, r.ecovalence, r.shuklaVariance, r.reading]),
    });
    tables.push({
      name: "GGE biplot",
      columns: ["Kind", "Entry code or site", "Variety", "Component 1", "Component 2"],
      rows: [
        ...stability.gge.entries.map((g): Cell[] => ["entry", g.blindCode, name(g), g.pc1, g.pc2]),
        ...stability.gge.sites.map((g): Cell[] => ["site", g.siteName, null, g.pc1, g.pc2]),
        ["share explained", "", null, stability.gge.explained[0], stability.gge.explained[1]],
      ],
    });
  }
  if (result.missing.length > 0) {
    tables.push({ name: "Missing plots", columns: ["Plot", "Site", "Block", "Entry code", "Why missing", "How handled"], rows: result.missing.map((m) => [m.plotCode, m.siteName, m.block, m.blindCode, m.reason, m.handling]) });
  }
  tables.push(...mixedExportTables(result.mixed, withNames));
  tables.push({ name: "Notes", columns: ["Kind", "Text"], rows: [...result.warnings.map((w): Cell[] => ["warning", w]), ...result.notes.map((n): Cell[] => ["note", n]), ...(result.mixed?.notes ?? []).map((n): Cell[] => ["mixed model", n])] });
  tables.push(dataDictionary(result));
  return tables;
}

function dataDictionary(result: AnalysisResult): ExportTable {
  const unit = result.trait.computation !== "none" || result.trait.valueType === "date" ? "days" : (result.trait.unit ?? "as recorded");
  return {
    name: "Data dictionary",
    columns: ["Sheet", "Column", "Meaning"],
    rows: [
      ["Raw data", "Plot", "Plot code printed on the label: site, block and position."],
      ["Raw data", "Block", "Randomised complete block within the site."],
      ["Raw data", "Entry code", "Blind code growers saw; the variety column decodes it (staff only)."],
      ["Raw data", "Value", `${result.trait.analysedAs}, in ${unit}. Dates are converted to whole days from the site's sowing date.`],
      ["Raw data", "Status", "used; missing (nothing recorded or a missing-plot reason); excluded (left out by a coordinator, reason on the Settings sheet). Missing and excluded plots are blank in Value and are not imputed."],
      ["Means", "Mean", "Arithmetic mean of the entry's plots used."],
      ["Means", "LS mean", "Least-squares mean adjusted for blocks (and sites); equals Mean when no plot is missing."],
      ["Means", "SE", "Standard error of the LS mean, from the entry test's error term."],
      ["Means", "Group", "Entries sharing a letter do not differ at alpha 0.05 (protected LSD or Tukey, see Settings). Blank when the F test was not significant under protected LSD."],
      ["Means", "LSD 0.05", "Least significant difference; blank when not given. With missing plots it is the average over pairs."],
      ["Means", "CV %", "100 x square root of the error mean square / grand mean."],
      ["ANOVA", "Tested against", `Error term of the F test: with random sites, varieties are tested against ${ANOVA_SOURCE_LABELS["entry:site"]}.`],
      ["Emergence", "Emergence %", "Seedlings emerged / seeds sown x 100, pooled over plots; 95% Wilson score interval."],
      ["Stability", "Slope on site mean", "Finlay-Wilkinson slope of the entry's site means on the site means (all entries): 1 = average response, above 1 responds more to good sites, below 1 steadier. Needs 3 or more sites."],
      ["Stability", "Deviation MS", "Residual mean square about that line (Eberhart-Russell), tested against plot error / plots per site mean."],
      ["Stability", "Ecovalence", "Wricke's ecovalence: the entry's sum of squares of the entry x site interaction."],
      ["Stability", "Shukla variance", "Shukla's (1972) stability variance: the entry's own interaction variance; 0 or below = as steady as the trial can tell."],
      ["GGE biplot", "Component 1, 2", "Scores of the entry x site table of means centred by site (singular value decomposition, symmetric scaling); share explained in the last row."],
    ],
  };
}
