"use client";
import { useId, useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { planTrial, PLANNING_MAX_BLOCKS, TARGET_POWER, isStatsError, type TrialPlan } from "@/lib/domain/stats";
import { CV_TARGET, formatNumber } from "@/lib/domain/analysis/format";
import { plural } from "@/lib/domain/vocabulary/words";
import { pastTrialPlanSchema, typedPlanSchema } from "@/lib/validation/planning";
import type { PlanningSource } from "@/db/queries/planning";
import type { PlanningBaseline } from "@/server/trials/planning";
import { useTrialDetail, type TrialDetailJson } from "./trial-data";

const ALPHA = 0.05;
const inputClass = "block min-h-11 w-full rounded-lg border border-loam-300 bg-white px-3 text-base";

async function fetchBaseline(trialId: number, from: number, trait: number): Promise<PlanningBaseline> {
  const res = await fetch(`/api/trials/${trialId}/planning?from=${from}&trait=${trait}`, { headers: { Accept: "application/json" } });
  const body = await res.json().catch(() => null);
  if (!res.ok) throw new Error((body as { error?: string } | null)?.error ?? "The past trial's CV could not be loaded. Try again in a moment.");
  return body as PlanningBaseline;
}

/**
 * How many blocks this trial needs: from a past trial's CV (or a typed one) and the difference worth
 * detecting, the chance of finding that difference with the entries, blocks and sites as they stand.
 * Nothing is stored; the numbers are worked out in the browser by lib/domain/stats planTrial.
 */
export function PlanningPanel({ trialId, initial, blocks, sources, previousTrialId }: { trialId: number; initial: TrialDetailJson; blocks: number; sources: PlanningSource[]; previousTrialId: number | null }) {
  const { data } = useTrialDetail(trialId, initial);
  const entries = (data ?? initial).entries.length;
  const sites = (data ?? initial).sites.length;
  const ids = useId();
  const firstSource = sources.find((s) => s.id === previousTrialId) ?? sources[0];
  const [mode, setMode] = useState<"past" | "typed">(firstSource ? "past" : "typed");
  const [sourceId, setSourceId] = useState<number | null>(firstSource?.id ?? null);
  const source = sources.find((s) => s.id === sourceId) ?? null;
  const [traitId, setTraitId] = useState<number | null>(firstSource?.traits[0]?.id ?? null);
  const [difference, setDifference] = useState("");
  const [cv, setCv] = useState("");
  const [differencePercent, setDifferencePercent] = useState("");

  const baseline = useQuery({
    queryKey: ["trial", trialId, "planning", sourceId, traitId],
    queryFn: () => fetchBaseline(trialId, sourceId!, traitId!),
    enabled: mode === "past" && sourceId !== null && traitId !== null,
    staleTime: 60_000,
  });

  let plan: TrialPlan | null = null;
  let problem: string | null = null;
  let differenceWords = "";
  if (entries < 2 || sites < 1) {
    problem = `Add at least 2 entries and enrol at least 1 site to see the power (now ${plural(entries, "entry", "entries")} and ${plural(sites, "site")}).`;
  } else if (mode === "past") {
    const parsed = pastTrialPlanSchema.safeParse({ difference });
    if (!baseline.data) problem = null;
    else if (difference.trim() === "") problem = null;
    else if (!parsed.success) problem = parsed.error.issues[0]!.message;
    else {
      differenceWords = `${formatNumber(parsed.data.difference)}${baseline.data.trait.differenceUnit ? ` ${baseline.data.trait.differenceUnit}` : ""}`;
      plan = run({ cv: baseline.data.cv, mean: baseline.data.mean, difference: parsed.data.difference, entries, blocks, sites });
    }
  } else {
    const parsed = typedPlanSchema.safeParse({ cv, differencePercent });
    if (cv.trim() === "" || differencePercent.trim() === "") problem = null;
    else if (!parsed.success) problem = parsed.error.issues[0]!.message;
    else {
      differenceWords = `${formatNumber(parsed.data.differencePercent, Number.isInteger(parsed.data.differencePercent) ? 0 : 1)}% of the mean`;
      plan = run({ cv: parsed.data.cv, mean: 100, difference: parsed.data.differencePercent, entries, blocks, sites });
    }
  }
  function run(p: Parameters<typeof planTrial>[0]): TrialPlan | null {
    try {
      return planTrial({ ...p, alpha: ALPHA });
    } catch (e) {
      if (!isStatsError(e)) throw e;
      problem = e.message;
      return null;
    }
  }
  const lsdWords = (x: number) =>
    mode === "past" && baseline.data ? `${formatNumber(x)}${baseline.data.trait.differenceUnit ? ` ${baseline.data.trait.differenceUnit}` : ""}` : `${formatNumber(x, 1)}% of the mean`;
  const usedCv = mode === "past" ? baseline.data?.cv : Number(cv);

  return (
    <div className="space-y-4" data-testid="planning">
      <p className="text-sm">
        How likely is this trial to show a real difference between two varieties? It depends on the plot-to-plot variation (the CV), the difference you care about, and the
        number of blocks and sites. This trial now has {plural(entries, "entry", "entries")}, {plural(blocks, "block")} per site and {plural(sites, "enrolled site")}.
      </p>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Where the CV comes from</legend>
        <div className="flex flex-wrap gap-2">
          <label className="flex min-h-11 items-center gap-2 rounded-lg border border-loam-300 px-3">
            <input type="radio" name={`${ids}-mode`} checked={mode === "past"} disabled={sources.length === 0} onChange={() => setMode("past")} />
            A past trial of this crop
          </label>
          <label className="flex min-h-11 items-center gap-2 rounded-lg border border-loam-300 px-3">
            <input type="radio" name={`${ids}-mode`} checked={mode === "typed"} onChange={() => setMode("typed")} />
            Type a CV
          </label>
        </div>
        {sources.length === 0 && <p className="text-sm text-loam-700">None of your other trials of this crop has recorded values yet, so type a CV ({CV_TARGET}% is a usual target for a well-run trial).</p>}
      </fieldset>

      {mode === "past" && source ? (
        <div className="grid gap-3 sm:grid-cols-3">
          <div className="space-y-1">
            <label htmlFor={`${ids}-source`} className="block text-sm font-semibold">Past trial</label>
            <select
              id={`${ids}-source`}
              className={inputClass}
              value={source.id}
              onChange={(e) => {
                const next = sources.find((s) => s.id === Number(e.target.value))!;
                setSourceId(next.id);
                setTraitId(next.traits[0]?.id ?? null);
              }}
            >
              {sources.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.code} {s.title} ({s.season})
                </option>
              ))}
            </select>
          </div>
          <div className="space-y-1">
            <label htmlFor={`${ids}-trait`} className="block text-sm font-semibold">Trait</label>
            <select id={`${ids}-trait`} className={inputClass} value={traitId ?? ""} onChange={(e) => setTraitId(Number(e.target.value))}>
              {source.traits.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </select>
          </div>
          <div className="space-y-1">
            <label htmlFor={`${ids}-difference`} className="block text-sm font-semibold">
              Difference worth detecting{baseline.data?.trait.differenceUnit ? ` (${baseline.data.trait.differenceUnit})` : ""}
            </label>
            <input id={`${ids}-difference`} inputMode="decimal" className={inputClass} value={difference} onChange={(e) => setDifference(e.target.value)} />
          </div>
          <p className="text-sm sm:col-span-3" aria-live="polite" data-testid="planning-baseline">
            {baseline.isFetching
              ? "Reading the past trial's analysis…"
              : baseline.error
                ? <span className="font-semibold text-beet-700">{baseline.error.message}</span>
                : baseline.data
                  ? `${baseline.data.trial.code} reached a CV of ${formatNumber(baseline.data.cv, 1)}% for ${baseline.data.trait.name.toLowerCase()}, with a mean of ${formatNumber(baseline.data.mean)}${baseline.data.trait.unit ? ` ${baseline.data.trait.unit}` : ""} (from ${baseline.data.from}, accepted data only).`
                  : null}
          </p>
        </div>
      ) : (
        <div className="grid gap-3 sm:grid-cols-2">
          <div className="space-y-1">
            <label htmlFor={`${ids}-cv`} className="block text-sm font-semibold">CV (%)</label>
            <input id={`${ids}-cv`} inputMode="decimal" className={inputClass} value={cv} onChange={(e) => setCv(e.target.value)} />
          </div>
          <div className="space-y-1">
            <label htmlFor={`${ids}-percent`} className="block text-sm font-semibold">Difference worth detecting (% of the mean)</label>
            <input id={`${ids}-percent`} inputMode="decimal" className={inputClass} value={differencePercent} onChange={(e) => setDifferencePercent(e.target.value)} />
          </div>
        </div>
      )}

      <div aria-live="polite" data-testid="planning-result" className="space-y-2">
        {problem && <p className="font-semibold text-beet-700">{problem}</p>}
        {plan && (
          <>
            <p className="text-lg">
              With {plural(blocks, "block")} at each of {plural(sites, "site")}, a real difference of {differenceWords} between two varieties would show as a clear difference in{" "}
              <strong>{formatNumber(100 * plan.power, 0)} of 100 trials</strong> like this one (its power is {formatNumber(100 * plan.power, 0)}%)
              {plan.power >= TARGET_POWER ? ", which meets the usual aim of 80%." : ", short of the usual aim of 80%."}
            </p>
            <p>
              {plan.blocksForPower80 === null
                ? `No trial of up to ${PLANNING_MAX_BLOCKS} blocks per site at ${plural(sites, "site")} reaches 80%: look for a larger difference, add sites, or cut plot-to-plot variation.`
                : plan.blocksForPower80 <= blocks
                  ? `${plural(plan.blocksForPower80, "block")} per site would already reach 80%.`
                  : `${plural(plan.blocksForPower80, "block")} per site would reach 80% at ${plural(sites, "site")}.`}{" "}
              Two varieties closer than {lsdWords(plan.lsd)} (the least significant difference) will not show as clearly different.
            </p>
          </>
        )}
        <p className="text-sm text-loam-700">
          Assumptions: plot-to-plot variation like {usedCv && Number.isFinite(usedCv) ? `a CV of ${formatNumber(usedCv, 1)}%` : "the CV above"} at every site; every plot recorded; two varieties compared at a time with a
          two-sided test at α = {ALPHA}, against the plot-to-plot error of all sites together. Varieties that change places from site to site make
          real differences harder to show than this says, so treat the figures as the best case.
        </p>
      </div>
    </div>
  );
}
