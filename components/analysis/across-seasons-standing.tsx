import { useTranslations } from "next-intl";
import type { UnitShape } from "@/lib/domain/analysis/format";
import { useFigures } from "@/components/public/use-figures";

export interface StandingRow {
  traitCode: string;
  trait: UnitShape & { analysedAs: string; betterWhen: "higher" | "lower" | "neither" };
  seasons: number;
  standing: { mean: number; se: number; rank: number | null; of: number; percentOfCheck: number | null; letter: string | null; environments: number; totalEnvironments: number; interactionWords: string };
}

/**
 * A variety's standing over every season at once (REML mixed model, site-years random), one line per
 * trait. A rank only where the trait has a better direction. In the page's language; the trait names come
 * already worded by the caller.
 */
export function AcrossSeasonsStanding({ rows, name }: { rows: StandingRow[]; name: string }) {
  const t = useTranslations("publicTables");
  const figures = useFigures();
  if (rows.length === 0) return null;
  return (
    <div className="space-y-2" data-testid="across-seasons-standing">
      <p className="text-sm text-loam-700">{t("acrossIntro", { name })}</p>
      <ul className="list-disc space-y-1 pl-5">
        {rows.map((r) => (
          <li key={r.traitCode}>
            <strong>{r.trait.analysedAs}</strong>:{" "}
            {t("acrossLine", {
              value: figures.value(r.trait, r.standing.mean),
              se: figures.difference(r.trait, r.standing.se),
              seasons: String(r.seasons),
              environments: String(r.standing.environments),
              total: String(r.standing.totalEnvironments),
            })}
            {r.standing.rank !== null ? t("acrossRanked", { rank: String(r.standing.rank), of: String(r.standing.of) }) : t("acrossNotRanked", { of: String(r.standing.of) })}
            {r.standing.percentOfCheck !== null ? t("acrossCheck", { percent: figures.number(r.standing.percentOfCheck, 0) }) : ""}
            {r.standing.letter ? t("acrossGroup", { letter: r.standing.letter }) : ""}. <span className="text-loam-700">{r.standing.interactionWords}</span>
          </li>
        ))}
      </ul>
      <p className="text-sm text-loam-700">{t("lettersNote")}</p>
    </div>
  );
}
