import { formatNumber, valueWithUnit, differenceWithUnit, type UnitShape } from "@/lib/domain/analysis/format";

export interface StandingRow {
  traitCode: string;
  trait: UnitShape & { analysedAs: string; betterWhen: "higher" | "lower" | "neither" };
  seasons: number;
  standing: { mean: number; se: number; rank: number | null; of: number; percentOfCheck: number | null; letter: string | null; environments: number; totalEnvironments: number; interactionWords: string };
}

/**
 * A variety's standing over every season at once (REML mixed model, site-years random), one line per
 * trait. A rank only where the trait has a better direction.
 */
export function AcrossSeasonsStanding({ rows, name }: { rows: StandingRow[]; name: string }) {
  if (rows.length === 0) return null;
  return (
    <div className="space-y-2" data-testid="across-seasons-standing">
      <p className="text-sm text-loam-700">
        All seasons analysed together (REML mixed model: each site in each season is one site-year, a random effect), so {name} is compared with varieties
        it did not meet every season through the ones it did.
      </p>
      <ul className="list-disc space-y-1 pl-5">
        {rows.map((r) => (
          <li key={r.traitCode}>
            <strong>{r.trait.analysedAs}</strong>: {valueWithUnit(r.trait, r.standing.mean)} ± {differenceWithUnit(r.trait, r.standing.se)} (SE) over {r.seasons} seasons,
            grown in {r.standing.environments} of {r.standing.totalEnvironments} site-years
            {r.standing.rank !== null ? `; ranked ${r.standing.rank} of ${r.standing.of}` : `; one of ${r.standing.of} varieties (no better direction, so not ranked)`}
            {r.standing.percentOfCheck !== null ? `; ${formatNumber(r.standing.percentOfCheck, 0)}% of the check` : ""}
            {r.standing.letter ? `; group ${r.standing.letter}` : ""}. <span className="text-loam-700">{r.standing.interactionWords}</span>
          </li>
        ))}
      </ul>
      <p className="text-sm text-loam-700">Varieties sharing a group letter do not differ at the 5% level.</p>
    </div>
  );
}
