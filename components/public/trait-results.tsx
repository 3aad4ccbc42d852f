"use client";
import { useLocale, useTranslations } from "next-intl";
import type { PublicTraitView } from "@/lib/domain/publish/public-view";
import { extremeWord } from "@/lib/domain/analysis/ranking";
import { InteractionChart, MeansChart } from "@/components/analysis/analysis-charts";
import { PublicMeansTable } from "./public-means-table";
import { useFigures } from "./use-figures";

const nameOf = (e: { blindCode: string; varietyName?: string | null }) => e.varietyName ?? e.blindCode;

/** One published trait: chart, means table (rank by the trait's direction, group letters, % of check) and the key figures. */
export function PublicTraitResults({ view }: { view: PublicTraitView }) {
  const t = useTranslations("publicTables");
  const figures = useFigures();
  // English keeps the charts' own wording (shared with the staff pages); other languages word them here.
  const translated = useLocale() !== "en";
  const { block, unit, scope } = view;
  if (!block) return <p className="text-loam-700">{view.problem ?? t("noData")}</p>;
  const byCode = new Map(block.means.map((m) => [m.blindCode, nameOf(m)]));
  const hasCheck = block.means.some((m) => m.isCheck);
  const direction = { betterWhen: view.betterWhen, computation: view.computation };
  const word = extremeWord(direction, "first");
  return (
    <div className="space-y-4">
      <p className="text-loam-700">
        {t("means", { scope, cv: block.cv === null || !Number.isFinite(block.cv) ? "none" : figures.number(block.cv, 1), lsd: block.lsd === null ? "none" : figures.number(block.lsd), p: figures.p(block.entryP) })}
      </p>
      <p data-testid="order-sentence">{view.orderSentence}</p>
      <MeansChart
        means={block.means}
        lsd={block.lsd}
        label={nameOf}
        unit={unit}
        title={view.analysedAs}
        order={view.order}
        words={translated ? {
          number: figures.number,
          summary: (values, lsd) => t("chartMeans", { title: view.analysedAs, order: view.order, values, bars: lsd === null ? t("chartBarsSe") : t("chartBarsLsd", { lsd: figures.number(lsd) }) }),
        } : undefined}
      />
      <PublicMeansTable means={block.means} betterWhen={view.betterWhen} unit={unit} caption={t("meansCaption", { trait: view.analysedAs })} />
      <p className="text-sm text-loam-700">
        {block.comparisonNote}
        {hasCheck && ` ${t("checkNote")}`}
      </p>
      {view.combined && view.combined.cellMeans.length > 0 && (
        <details className="rounded-lg border border-husk-200 bg-white p-3">
          <summary className="cursor-pointer font-semibold">{t("byLocation")}</summary>
          <InteractionChart
            cells={view.combined.cellMeans.map((c) => ({ siteName: c.siteName, mean: c.mean, entry: byCode.get(c.blindCode) ?? c.blindCode }))}
            order={block.means.map(nameOf)}
            unit={unit}
            words={translated ? {
              title: t("chartInteractionTitle"),
              summary: (perSite) =>
                t("chartInteractionSummary", { first: view.betterWhen === "neither" ? t("chartFirstPerSite", { word }) : t("chartBestPerSite", { word }), perSite }),
            } : undefined}
          />
        </details>
      )}
    </div>
  );
}
