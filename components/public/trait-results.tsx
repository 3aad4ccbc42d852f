"use client";
import type { PublicTraitView } from "@/lib/domain/publish/public-view";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import { InteractionChart, MeansChart } from "@/components/analysis/analysis-charts";
import { MeansTable } from "@/components/analysis/analysis-tables";

const nameOf = (e: { blindCode: string; varietyName?: string | null }) => e.varietyName ?? e.blindCode;

/** One published trait: chart, sortable means table and the key figures, with names revealed. */
export function PublicTraitResults({ view }: { view: PublicTraitView }) {
  const { block, unit, scope } = view;
  if (!block) return <p className="text-loam-700">{view.problem ?? "Not enough data for this trait."}</p>;
  const byCode = new Map(block.means.map((m) => [m.blindCode, nameOf(m)]));
  return (
    <div className="space-y-4">
      <p className="text-loam-700">
        Means {scope}. CV {formatNumber(block.cv, 1)}%, LSD 0.05 {block.lsd === null ? "not shown (no significant difference)" : formatNumber(block.lsd)}, variety test {formatP(block.entryP)}.
      </p>
      <MeansChart means={block.means} lsd={block.lsd} label={nameOf} unit={unit} title={view.analysedAs} />
      <MeansTable means={block.means} label={nameOf} unit={unit} caption={`Means: ${view.analysedAs}`} />
      <p className="text-sm text-loam-700">{block.comparisonNote}</p>
      {view.combined && view.combined.cellMeans.length > 0 && (
        <details className="rounded-lg border border-husk-200 bg-white p-3">
          <summary className="cursor-pointer font-semibold">Variety by site</summary>
          <InteractionChart
            cells={view.combined.cellMeans.map((c) => ({ siteName: c.siteName, mean: c.mean, entry: byCode.get(c.blindCode) ?? c.blindCode }))}
            order={block.means.map(nameOf)}
            unit={unit}
          />
        </details>
      )}
    </div>
  );
}
