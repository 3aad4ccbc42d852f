"use client";
import type { AnalysisResult } from "@/lib/analysis/types";
import { formatNumber, formatP } from "@/lib/analysis/format";
import { InteractionChart, MeansChart } from "@/components/analysis/analysis-charts";
import { MeansTable } from "@/components/analysis/analysis-tables";

const nameOf = (e: { blindCode: string; varietyName: string | null }) => e.varietyName ?? e.blindCode;

/** One published trait: chart, sortable means table and the key figures, with names revealed. */
export function PublicTraitResults({ result }: { result: AnalysisResult }) {
  const block = result.combined ?? result.perSite.find((s) => s.result)?.result ?? null;
  if (!block) return <p className="text-loam-700">{result.combinedProblem ?? "Not enough data for this trait."}</p>;
  const unit = result.trait.computation !== "none" || result.trait.valueType === "date" ? "days" : (result.trait.unit ?? "");
  const byId = new Map(block.means.map((m) => [m.entryId, nameOf(m)]));
  const scope = result.combined ? `across ${result.combined.sites} sites` : `at ${result.perSite.find((s) => s.result)?.siteName}`;
  return (
    <div className="space-y-4">
      <p className="text-loam-700">
        Means {scope}. CV {formatNumber(block.cv, 1)}%, LSD 0.05 {block.lsd === null ? "not shown (no significant difference)" : formatNumber(block.lsd)}, variety test {formatP(block.entryP)}.
      </p>
      <MeansChart means={block.means} lsd={block.lsd} label={nameOf} unit={unit} title={result.trait.analysedAs} />
      <MeansTable means={block.means} label={nameOf} unit={unit} caption={`Means: ${result.trait.analysedAs}`} />
      <p className="text-sm text-loam-700">{block.comparisonNote}</p>
      {result.combined && result.combined.cellMeans.length > 0 && (
        <details className="rounded-lg border border-husk-200 bg-white p-3">
          <summary className="cursor-pointer font-semibold">Variety by site</summary>
          <InteractionChart combined={result.combined} label={(id) => byId.get(id) ?? String(id)} order={block.means.map(nameOf)} unit={unit} />
        </details>
      )}
    </div>
  );
}
