"use client";
import type { PublicTraitView } from "@/lib/domain/publish/public-view";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import { InteractionChart, MeansChart } from "@/components/analysis/analysis-charts";
import { PublicMeansTable } from "./public-means-table";

const nameOf = (e: { blindCode: string; varietyName?: string | null }) => e.varietyName ?? e.blindCode;

/** How the list is ordered and what a rank means, in one plain sentence (from `orderWords`: "earliest first (earlier is better)"). */
export function orderSentence(view: Pick<PublicTraitView, "order" | "betterWhen">): string {
  const [, first = view.order, why = ""] = /^(\w+) first \((.*)\)$/.exec(view.order) ?? [];
  if (view.betterWhen === "neither") return `Listed ${first} first; ${why}, so no variety is ranked or called best.`;
  return `Listed ${first} first: ${why} for this trait, so rank 1 has the ${first} mean.`;
}

/** One published trait: chart, means table (rank by the trait's direction, group letters, % of check) and the key figures. */
export function PublicTraitResults({ view }: { view: PublicTraitView }) {
  const { block, unit, scope } = view;
  if (!block) return <p className="text-loam-700">{view.problem ?? "Not enough data for this trait."}</p>;
  const byCode = new Map(block.means.map((m) => [m.blindCode, nameOf(m)]));
  const hasCheck = block.means.some((m) => m.isCheck);
  return (
    <div className="space-y-4">
      <p className="text-loam-700">
        Means {scope}. CV {formatNumber(block.cv, 1)}%, LSD 0.05 {block.lsd === null ? "not shown (no significant difference)" : formatNumber(block.lsd)}, variety test {formatP(block.entryP)}.
      </p>
      <p data-testid="order-sentence">{orderSentence(view)}</p>
      <MeansChart means={block.means} lsd={block.lsd} label={nameOf} unit={unit} title={view.analysedAs} order={view.order} />
      <PublicMeansTable means={block.means} betterWhen={view.betterWhen} unit={unit} caption={`Means: ${view.analysedAs}`} />
      <p className="text-sm text-loam-700">
        {block.comparisonNote}
        {hasCheck && " % of check is each variety's mean as a percentage of the check variety's (check = 100); the difference is beyond the LSD when it is larger than the least significant difference at 5%."}
      </p>
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
