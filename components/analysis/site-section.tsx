"use client";
import { useQuery } from "@tanstack/react-query";
import type { SiteSection } from "@/lib/domain/analysis/page-view";
import { capitalise } from "@/lib/domain/vocabulary/words";
import { AnovaTable, GerminationTable, MeansTable, type EntryLabel, type MeanRow } from "./analysis-tables";

async function fetchSiteSection(trialId: number, siteId: number, query: string): Promise<SiteSection> {
  const res = await fetch(`/api/trials/${trialId}/analysis/sites/${siteId}?${query}`, { headers: { Accept: "application/json" } });
  const body = await res.json().catch(() => null);
  if (!res.ok) throw new Error(body?.error ?? "This site's results could not be loaded. Close the section and open it again in a moment.");
  return body as SiteSection;
}

/**
 * The body of one site's section on the analysis page: its means with letters, its ANOVA and its emergence
 * counts, fetched for the page's current settings when the section is opened (a trial of 50 sites would
 * otherwise carry 50 sets of tables in its first view). Mounted only while the section is open.
 */
export function SiteSectionBody({
  trialId,
  siteId,
  siteName,
  query,
  label,
  unit,
  order,
  inUnit,
}: {
  trialId: number;
  siteId: number;
  siteName: string;
  /** the page's settings as a search string, so the section matches the rest of the page */
  query: string;
  label: EntryLabel;
  unit: string;
  order: string;
  /** the means in the unit shown above the tables */
  inUnit: <M extends MeanRow>(means: M[]) => M[];
}) {
  const { data, error, isPending } = useQuery({ queryKey: ["analysis-site", trialId, siteId, query], queryFn: () => fetchSiteSection(trialId, siteId, query) });
  if (isPending) {
    return (
      <p role="status" className="pb-3 text-sm text-loam-700">
        Loading the results at {siteName}…
      </p>
    );
  }
  if (error) {
    return (
      <p role="alert" className="pb-3 font-semibold text-beet-700">
        {error.message}
      </p>
    );
  }
  const result = data.site.result;
  return (
    <div className="space-y-3 pb-3">
      {result ? (
        <>
          <MeansTable means={inUnit(result.means)} label={label} unit={unit} order={order} caption={`Entry means at ${siteName}`} />
          <p className="text-sm">{capitalise(result.comparisonNote)}</p>
          <AnovaTable rows={result.rows} caption={`Analysis of variance at ${siteName}`} />
        </>
      ) : (
        <p className="text-sm">{data.site.problem}</p>
      )}
      {data.germination.length > 0 && <GerminationTable rows={data.germination} label={label} bySite={false} caption={`Emergence per entry at ${siteName}`} />}
    </div>
  );
}
