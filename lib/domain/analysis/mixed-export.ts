/**
 * The mixed-model tables for the analysis export (xlsx sheets, CSV tables), from the same result the
 * page shows. Variety names only where the export carries names (staff files).
 */
import type { Cell, ExportTable } from "./export";
import type { MixedAnalysis } from "./mixed";
import { termWords } from "./mixed";

export const MIXED_SHEETS = { components: "Mixed model", means: "Mixed means", pairs: "Mixed pairs" } as const;

export function mixedExportTables(mixed: MixedAnalysis | null | undefined, withNames: boolean): ExportTable[] {
  if (!mixed) return [];
  const name = (e: { varietyName: string | null }) => (withNames ? e.varietyName : null);
  const env = mixed.environmentWord;
  const components: ExportTable = {
    name: MIXED_SHEETS.components,
    columns: ["Source", "Variance", "SD", "% of the variation", "Meaning"],
    rows: [
      ...mixed.components.map((c): Cell[] => [termWords(c.term, env), c.variance, Math.sqrt(Math.max(c.variance, 0)), c.share, c.words]),
      ["Variety F test", mixed.entryTest.f, null, null, `F on ${mixed.entryTest.numDf} and ${mixed.entryTest.denDf.toFixed(2)} df (${mixed.dfMethod}), p = ${mixed.entryTest.p}`],
      ["REML criterion", mixed.remlCriterion, null, null, `-2 x restricted log-likelihood; ${mixed.environments.length} ${env}s, ${mixed.n} plots${mixed.singular ? "; a variance estimated at zero" : ""}`],
    ],
  };
  const means: ExportTable = {
    name: MIXED_SHEETS.means,
    columns: ["Entry", "Variety", "Check", "Mean", "SE", "df", "Plots", `${env}s grown`, "Group", "Rank", "% of check", "Difference from check"],
    rows: mixed.means.map((m): Cell[] => [m.blindCode, name(m), m.isCheck, m.mean, m.se, m.df, m.n, m.environments, m.letter, m.rank, m.percentOfCheck, m.checkDifference]),
  };
  const byKey = new Map(mixed.means.map((m) => [m.key, m]));
  const pairs: ExportTable = {
    name: MIXED_SHEETS.pairs,
    columns: ["First", "Second", "First variety", "Second variety", "Difference (first - second)", "SE", "df", "t", "p"],
    rows: mixed.pairs.map((p): Cell[] => {
      const a = byKey.get(p.a)!;
      const b = byKey.get(p.b)!;
      return [a.blindCode, b.blindCode, name(a), name(b), p.diff, p.se, p.df, p.t, p.p];
    }),
  };
  return [components, means, pairs];
}
