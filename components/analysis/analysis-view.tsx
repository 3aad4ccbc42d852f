"use client";
import { useEffect, useMemo, useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { AnalysisSettings } from "@/lib/domain/analysis/types";
import { gridCells, type AnalysisPageView } from "@/lib/domain/analysis/page-view";
import { cvWords, differenceWithUnit, formatP, inShownUnit, unitHeading, valueWithUnit } from "@/lib/domain/analysis/format";
import type { AnalysisBlock } from "@/lib/domain/analysis/types";
import { Card } from "@/components/ui/card";
import { SubmissionStatusBadge } from "@/components/ui/status-badge";
import { buttonClasses } from "@/components/ui/button";
import { AnovaTable, EmergenceTimeTable, GerminationTable, LabelTable, MeansTable, MissingTable, type EntryLabel } from "./analysis-tables";
import { SiteSectionBody } from "./site-section";
import { EmergenceChart, GerminationChart, InteractionChart, MeansChart, SiteResponseChart } from "./analysis-charts";
import { ExclusionPanel, type ExclusionTargets } from "./exclusion-panel";
import { StabilityPanel } from "./stability-panel";
import { SharingPanel } from "./sharing-panel";
import { LazyDetails } from "./lazy-details";
import { DirectionPanel } from "./direction-panel";
import { MixedModelSection } from "./mixed-model-card";
import { orderWords } from "@/lib/domain/analysis/ranking";

/** URL search string for settings; the same string is the API query, the export query and the page URL. */
export function settingsQuery(s: AnalysisSettings): string {
  const q = new URLSearchParams({ trait: String(s.traitId) });
  if (s.siteIds) q.set("sites", s.siteIds.join(","));
  if (s.includeUnaccepted) q.set("unaccepted", "1");
  if (s.siteModel !== "random") q.set("model", s.siteModel);
  if (s.separation !== "lsd") q.set("compare", s.separation);
  if (s.mixed) q.set("mixed", "1");
  return q.toString();
}

async function fetchAnalysis(trialId: number, query: string): Promise<AnalysisPageView> {
  const res = await fetch(`/api/trials/${trialId}/analysis?${query}&page=1`, { headers: { Accept: "application/json" } });
  const body = await res.json().catch(() => null);
  if (!res.ok) throw new Error(body?.error ?? "The analysis could not be loaded. Try again in a moment.");
  return body as AnalysisPageView;
}


/**
 * The analysis page body: controls, notes, tables and charts, refetched as JSON when a setting changes. It holds
 * the slim first view (lib/domain/analysis/page-view); each site's tables are fetched when its section opens.
 */
export function AnalysisView({ trialId, initial, targets }: { trialId: number; initial: AnalysisPageView; targets: ExclusionTargets | null }) {
  // Exclusions, sharing and exports are for staff; `targets` is only given to them. Variety names come
  // only in a keyed payload: staff, or a grower once the trial is published.
  const staff = targets !== null;
  const [settings, setSettings] = useState<AnalysisSettings>(initial.settings);
  const [names, setNames] = useState(false);
  const query = settingsQuery(settings);
  const initialQuery = settingsQuery(initial.settings);
  const { data, isFetching, error } = useQuery({
    queryKey: ["analysis", trialId, query],
    queryFn: () => fetchAnalysis(trialId, query),
    initialData: query === initialQuery ? initial : undefined,
    placeholderData: keepPreviousData,
  });
  const result = data ?? initial;
  const keyed = "blind" in result ? null : result;

  // Keep the address bar in step so a view can be bookmarked or shared with another coordinator.
  useEffect(() => {
    window.history.replaceState(null, "", `?${query}`);
  }, [query]);

  const label: EntryLabel = (e) => (names && e.varietyName ? e.varietyName : e.blindCode);
  const siteCells = useMemo(() => {
    const byId = new Map<number, { blindCode: string; varietyName?: string | null }>();
    for (const m of result.combined?.means ?? []) byId.set(m.entryId, m);
    const siteNames = new Map(result.sites.map((s) => [s.id, s.name]));
    return (result.combined ? gridCells(result.combined.cellMeans) : []).map((c) => ({
      siteName: siteNames.get(c.siteId) ?? String(c.siteId),
      mean: inShownUnit(result.trait, c.value),
      entry: byId.has(c.entryId) ? label(byId.get(c.entryId)!) : String(c.entryId),
    }));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [result, names]);
  const order = (result.combined?.means ?? []).map((m) => label(m));
  // The chart's hollow per-site marks, from the first view's grid of per-site emergence %.
  const germinationBySite = useMemo(() => {
    if (!result.germination) return [];
    const byId = new Map(result.germination.byEntry.map((g) => [g.entryId, g]));
    const siteNames = new Map(result.sites.map((s) => [s.id, s.name]));
    return gridCells(result.germination.bySite).map((c) => ({ entry: byId.has(c.entryId) ? label(byId.get(c.entryId)!) : String(c.entryId), percent: c.value, site: siteNames.get(c.siteId) ?? "" }));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [result, names]);
  const emergenceOrder = [...new Set((result.emergence?.curve ?? []).map((c) => label(c)))];
  const unit = unitHeading(result.trait) ?? "";
  // Tables and charts show values in the unit named above them: a yes/no share as % yes.
  const shown = (x: number) => inShownUnit(result.trait, x);
  const inUnit = <M extends { mean: number; lsMean: number | null; se: number; checkDifference?: number | null }>(means: M[]): M[] =>
    means.map((m) => ({
      ...m,
      mean: shown(m.mean),
      lsMean: m.lsMean === null ? null : shown(m.lsMean),
      se: shown(m.se),
      ...(m.checkDifference !== undefined ? { checkDifference: m.checkDifference === null ? null : shown(m.checkDifference) } : {}),
    }));
  // A yes/no trait has no CV (see hasCv); its share of "yes" says more.
  const spread = (b: Pick<AnalysisBlock, "cv" | "grandMean">) => cvWords(b.cv) ?? `${valueWithUnit(result.trait, b.grandMean)} overall`;
  const update = (patch: Partial<AnalysisSettings>) => setSettings((s) => ({ ...s, ...patch }));
  const selectedSites = settings.siteIds ?? result.sites.map((s) => s.id);
  const toggleSite = (id: number) => {
    const next = selectedSites.includes(id) ? selectedSites.filter((x) => x !== id) : [...selectedSites, id];
    update({ siteIds: next.length === result.sites.length ? null : next.sort((a, b) => a - b) });
  };

  return (
    <div className="space-y-6">
      <Card title="What to analyse">
        <div className="grid gap-4 lg:grid-cols-3">
          <div className="space-y-1">
            <label htmlFor="trait" className="block text-sm font-semibold">
              Trait
            </label>
            <select
              id="trait"
              value={settings.traitId}
              onChange={(e) => update({ traitId: Number(e.target.value) })}
              className="block min-h-11 w-full rounded-lg border border-loam-300 bg-white px-3 text-base"
            >
              {result.traits.map((t) => (
                <option key={t.id} value={t.id} disabled={!t.analysable}>
                  {t.name}
                  {t.analysable ? "" : " (text, not analysed)"}
                </option>
              ))}
            </select>
            <p className="text-sm text-loam-700">Analysed as {result.trait.analysedAs}.</p>
            <DirectionPanel trialId={trialId} trait={result.trait} editable={staff && result.trial.status !== "archived"} />
          </div>
          <fieldset className="space-y-1">
            <legend className="text-sm font-semibold">Sites</legend>
            <p className="text-sm text-loam-700">{result.explanations.siteModel}</p>
            <div className="flex flex-wrap gap-2">
              {(["random", "fixed"] as const).map((m) => (
                <label key={m} className="flex min-h-11 items-center gap-2 rounded-lg border border-loam-300 px-3">
                  <input type="radio" name="siteModel" checked={settings.siteModel === m} onChange={() => update({ siteModel: m })} />
                  {m === "random" ? "Random (farms like these)" : "Fixed (these farms only)"}
                </label>
              ))}
            </div>
          </fieldset>
          <fieldset className="space-y-1">
            <legend className="text-sm font-semibold">Compare means with</legend>
            <p className="text-sm text-loam-700">{result.explanations.separation}</p>
            <div className="flex flex-wrap gap-2">
              {(["lsd", "tukey"] as const).map((m) => (
                <label key={m} className="flex min-h-11 items-center gap-2 rounded-lg border border-loam-300 px-3">
                  <input type="radio" name="separation" checked={settings.separation === m} onChange={() => update({ separation: m })} />
                  {m === "lsd" ? "Protected LSD 0.05" : "Tukey 0.05"}
                </label>
              ))}
            </div>
          </fieldset>
        </div>
        <fieldset className="mt-4 space-y-2">
          <legend className="text-sm font-semibold">Sites in the analysis</legend>
          <ul className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
            {result.sites.map((s) => (
              <li key={s.id}>
                <label className="flex min-h-11 items-start gap-2 rounded-lg border border-husk-200 px-3 py-2">
                  <input type="checkbox" className="mt-1 size-5" checked={selectedSites.includes(s.id)} onChange={() => toggleSite(s.id)} />
                  <span>
                    <span className="font-semibold">{s.name}</span> <SubmissionStatusBadge status={s.status} />
                    {s.why && s.why !== "not selected" && <span className="block text-sm text-loam-700">Left out: {s.why}</span>}
                  </span>
                </label>
              </li>
            ))}
          </ul>
          <label className="flex min-h-11 items-center gap-2">
            <input type="checkbox" className="size-5" checked={settings.includeUnaccepted} onChange={(e) => update({ includeUnaccepted: e.target.checked })} />
            Include data not yet accepted (draft, submitted or returned)
          </label>
          <p className="text-sm text-loam-700">{result.explanations.unaccepted}</p>
          {staff && (
            <label className="flex min-h-11 items-center gap-2">
              <input type="checkbox" className="size-5" checked={settings.mixed ?? false} onChange={(e) => update({ mixed: e.target.checked || undefined })} />
              Also fit the REML mixed model (sites, blocks and variety × site random; for missing plots and uneven sites)
            </label>
          )}
        </fieldset>
        {(staff || keyed) && <div className="mt-4 flex flex-wrap items-center gap-3">
          {keyed && <label className="flex min-h-11 items-center gap-2">
            <input type="checkbox" className="size-5" checked={names} onChange={(e) => setNames(e.target.checked)} />
            Show variety names instead of blind codes
          </label>}
          {staff && <><a className={buttonClasses("secondary")} href={`/api/trials/${trialId}/analysis/export?${query}&format=xlsx`}>
            Download .xlsx
          </a>
          <a className={buttonClasses("secondary")} href={`/api/trials/${trialId}/analysis/export?${query}&format=csv`}>
            Download CSV
          </a>
          {result.combined?.stability && <a className={buttonClasses("secondary")} href={`/api/trials/${trialId}/analysis/export?${query}&format=csv&table=stability`}>
            Download stability CSV
          </a>}</>}
        </div>}
      </Card>

      <div aria-live="polite" className="min-h-6 text-sm text-loam-700">
        {isFetching ? "Updating the analysis…" : error ? <span className="font-semibold text-beet-700">{error.message}</span> : null}
      </div>

      <div className={isFetching ? "space-y-6 opacity-60 transition-opacity" : "space-y-6"}>
        {result.warnings.length > 0 && (
          <section aria-labelledby="warnings-h" className="rounded-xl border border-marigold-400 bg-marigold-100 p-4">
            <h2 id="warnings-h" className="font-bold text-marigold-800">
              Check before you trust the figures
            </h2>
            <ul className="mt-2 list-disc space-y-1 pl-5">
              {result.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          </section>
        )}

        <Card title={`What the data say: ${result.trait.name}`}>
          <ul className="list-disc space-y-1 pl-5" data-testid="analysis-notes">
            {result.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
          <p className="mt-2 text-sm text-loam-700">
            {result.explanations.cv} {result.explanations.missing}
          </p>
        </Card>

        {result.combined ? (
          <Card title={`Across ${result.combined.sites} sites`}>
            <div className="grid gap-6 *:min-w-0 xl:grid-cols-2">
              <MeansChart means={inUnit(result.combined.means)} lsd={result.combined.lsd === null ? null : shown(result.combined.lsd)} label={label} unit={unit} title={`Combined means: ${result.trait.analysedAs}`} direction={result.trait} testId="means-chart" />
              <div className="space-y-2">
                <MeansTable means={inUnit(result.combined.means)} label={label} unit={unit} order={orderWords(result.trait)} caption="Combined entry means" testId="means-table" />
                <p className="text-sm">
                  {spread(result.combined)} · {result.combined.n} plots · varieties {formatP(result.combined.entryP)} · variety × site {formatP(result.combined.interactionP)}
                  {result.combined.bartlett && ` · Bartlett ${formatP(result.combined.bartlett.p)}`} · {result.combined.comparisonNote}
                </p>
              </div>
            </div>
            {names && staff && keyed?.combined && (
              <p className="mt-3 text-sm">
                Variety histories:{" "}
                {keyed.combined.means
                  .filter((m) => m.varietyId !== null && m.varietyName)
                  .map((m, i) => (
                    <span key={m.entryId}>
                      {i > 0 && " · "}
                      <a href={`/portal/varieties/${m.varietyId}`}>{m.varietyName}</a>
                    </span>
                  ))}
              </p>
            )}
            <details className="mt-4">
              <summary className="min-h-11 cursor-pointer py-2 font-semibold">Combined ANOVA table</summary>
              <AnovaTable rows={result.combined.rows} caption="Combined analysis of variance" />
            </details>
            <div className="mt-6 grid gap-6 *:min-w-0 xl:grid-cols-2">
              <InteractionChart cells={siteCells} order={order} unit={unit} direction={result.trait} />
              <SiteResponseChart cells={siteCells} order={order} unit={unit} direction={result.trait} slopes={result.combined.stability?.rows.map((r) => ({ entry: label(r), slope: r.slope }))} />
            </div>
            <StabilityPanel stability={result.combined.stability ?? null} problem={result.combined.stabilityProblem ?? null} label={label} order={order} shown={shown} />
          </Card>
        ) : (
          <Card title="Across sites">
            <p>{result.combinedProblem}</p>
          </Card>
        )}

        {keyed && settings.mixed && (keyed.mixed || keyed.mixedProblem) && (
          <Card title="Mixed model (REML) across sites">
            {keyed.mixed ? (
              <MixedModelSection mixed={keyed.mixed} trait={result.trait} label={label} unit={unit} order={orderWords(result.trait)} testId="mixed-model" />
            ) : (
              <p>{keyed.mixedProblem}</p>
            )}
          </Card>
        )}

        <Card title="Site by site">
          {result.perSite.length > 1 && <p className="mb-3 text-sm text-loam-700">Open a site for its entry means with letters{result.germination ? ", its analysis of variance and its emergence counts" : " and its analysis of variance"}.</p>}
          <div className="space-y-3">
            {result.perSite.map((s) => (
              <LazyDetails
                key={s.siteId}
                className="min-w-0 rounded-lg border border-husk-200 px-3"
                summaryClassName="min-h-11 cursor-pointer py-2"
                defaultOpen={result.perSite.length === 1}
                summary={
                  <>
                    <span className="font-semibold">{s.siteName}</span> {s.status !== "accepted" && <SubmissionStatusBadge status={s.status} />}{" "}
                    {s.result ? (
                      <span className="text-sm text-loam-700">
                        {spread(s.result)} · varieties {formatP(s.result.entryP)} · {s.result.lsd !== null ? `LSD ${differenceWithUnit(result.trait, s.result.lsd)}` : s.result.lettered ? "Tukey letters" : "no LSD"}
                      </span>
                    ) : (
                      <span className="text-sm text-beet-700">{s.problem}</span>
                    )}
                  </>
                }
              >
                <SiteSectionBody trialId={trialId} siteId={s.siteId} siteName={s.siteName} query={query} label={label} unit={unit} order={orderWords(result.trait)} inUnit={inUnit} />
              </LazyDetails>
            ))}
            {result.perSite.length === 0 && <p>No site is in the analysis. Tick sites above, or include data not yet accepted.</p>}
          </div>
        </Card>

        <Card title={`Missing plots (${result.missing.length})`}>
          {result.missing.length === 0 ? (
            <p className="text-sm">Every plot in the analysed sites has a value.</p>
          ) : (
            <LazyDetails summaryClassName="min-h-11 cursor-pointer py-2 font-semibold" summary={result.missing.length === 1 ? "Show the missing plot and why it is missing" : `Show the ${result.missing.length} missing plots and why each is missing`}>
              <MissingTable missing={result.missing} />
            </LazyDetails>
          )}
        </Card>

        {staff && keyed ? (
          <>
            <Card title="Exclusions">
              <ExclusionPanel trialId={trialId} result={result} targets={targets} />
            </Card>
            <Card title="Share site results with growers">
              <SharingPanel trialId={trialId} sites={result.sites} />
            </Card>
          </>
        ) : (
          result.exclusions.length > 0 && (
            <Card title="Left out of this trait by the coordinator">
              <ul className="list-disc pl-5">
                {result.exclusions.map((x) => (
                  <li key={x.id}>
                    {x.plotCode ? `Plot ${x.plotCode} (${x.siteName})` : `Whole site ${x.siteName}`}: {x.publicReason}
                  </li>
                ))}
              </ul>
            </Card>
          )
        )}

        {result.germination && (
          <Card title="Emergence (germination in the trial)">
            <p className="mb-3">{result.germination.note}</p>
            <div className="grid gap-6 *:min-w-0 xl:grid-cols-2">
              <GerminationChart germination={result.germination} sites={germinationBySite} label={label} />
              <GerminationTable rows={result.germination.byEntry} label={label} bySite={false} />
            </div>
            {keyed?.germination && (
              <>
                <h3 className="mt-6 mb-2 font-bold">Compared with the seed label</h3>
                <LabelTable rows={keyed.germination.labels} label={label} />
              </>
            )}
            <p className="mt-3 text-sm text-loam-700">Each site&apos;s counts are in its section under Site by site.</p>
          </Card>
        )}

        {result.emergence && (
          <Card title="Speed of emergence">
            <p className="mb-3">{result.emergence.note}</p>
            <div className="grid gap-6 *:min-w-0 xl:grid-cols-2">
              <EmergenceChart emergence={result.emergence} label={label} order={emergenceOrder} />
              <EmergenceTimeTable rows={result.emergence.kinetics} label={label} />
            </div>
          </Card>
        )}
      </div>
    </div>
  );
}
