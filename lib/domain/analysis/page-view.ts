/**
 * The analysis page's first view, and one site's section fetched when it is opened. A trial of 50 sites x 40
 * entries carries 50 per-site tables of means, 2,000 site-by-entry cells and 2,000 per-site germination rows;
 * sent whole, they made the page megabytes of HTML although a coordinator first reads the combined results.
 * So the first view keeps each site's one-line summary, and the site-by-entry figures the charts draw as
 * compact grids (one number per cell, in the order of the grid's sites and entries); a site's means, ANOVA
 * and germination rows come with `siteSectionOf` when its section is opened. Built from the viewer's own
 * view (lib/domain/analysis/blind.ts), so a grower's page carries nothing their view does not.
 */
import type { AnalysisPayload, BlindAnalysisPayload, ViewerAnalysis } from "./types";

/** Values per site and entry: `values[s * entryIds.length + e]` belongs to siteIds[s] and entryIds[e]; null where none. */
export interface SiteEntryGrid {
  siteIds: number[];
  entryIds: number[];
  values: (number | null)[];
}

/** What a closed site section shows: the site, and the figures its one-line summary reads. */
export interface SiteSummary {
  siteId: number;
  siteName: string;
  status: ViewerAnalysis["perSite"][number]["status"];
  blocks: number;
  result: { n: number; grandMean: number; cv: number | null; entryP: number | null; lsd: number | null; /** whether its means carry letters (Tukey's, when there is no LSD) */ lettered: boolean } | null;
  problem: string | null;
}

type PageViewOf<V extends ViewerAnalysis> = Omit<V, "perSite" | "combined" | "germination" | "plots"> & {
  perSite: SiteSummary[];
  combined: (Omit<NonNullable<V["combined"]>, "cellMeans"> & { cellMeans: SiteEntryGrid }) | null;
  /** `bySite` percents only, for the chart's per-site marks; the per-site rows come with each site's section */
  germination: (Omit<NonNullable<V["germination"]>, "bySite"> & { bySite: SiteEntryGrid }) | null;
};

export type AnalysisPageView = PageViewOf<AnalysisPayload> | PageViewOf<BlindAnalysisPayload>;

/** One site's section as its viewer may see it: that site's analysis and its germination rows. */
export type SiteSection<V extends ViewerAnalysis = ViewerAnalysis> = {
  site: V["perSite"][number];
  germination: NonNullable<V["germination"]>["bySite"];
};

/** A grid of the rows' values by site and entry, sites and entries in the order they first appear. */
export function toGrid<R>(rows: R[], siteOf: (r: R) => number, entryOf: (r: R) => number, valueOf: (r: R) => number): SiteEntryGrid {
  const siteIndex = new Map<number, number>();
  const entryIndex = new Map<number, number>();
  for (const r of rows) {
    if (!siteIndex.has(siteOf(r))) siteIndex.set(siteOf(r), siteIndex.size);
    if (!entryIndex.has(entryOf(r))) entryIndex.set(entryOf(r), entryIndex.size);
  }
  const values: (number | null)[] = new Array(siteIndex.size * entryIndex.size).fill(null);
  for (const r of rows) values[siteIndex.get(siteOf(r))! * entryIndex.size + entryIndex.get(entryOf(r))!] = valueOf(r);
  return { siteIds: [...siteIndex.keys()], entryIds: [...entryIndex.keys()], values };
}

/** The grid's cells with a value, in the order of the grid's sites, then entries. */
export function gridCells(grid: SiteEntryGrid): { siteId: number; entryId: number; value: number }[] {
  const cells: { siteId: number; entryId: number; value: number }[] = [];
  grid.siteIds.forEach((siteId, s) =>
    grid.entryIds.forEach((entryId, e) => {
      const value = grid.values[s * grid.entryIds.length + e];
      if (value !== null && value !== undefined) cells.push({ siteId, entryId, value });
    }),
  );
  return cells;
}

/** The first view of the analysis page for what the viewer may see. */
export function toPageView(view: ViewerAnalysis): AnalysisPageView {
  const { perSite, combined, germination, ...rest } = view as AnalysisPayload;
  delete rest.plots;
  return {
    ...rest,
    perSite: perSite.map((s) => ({
      siteId: s.siteId,
      siteName: s.siteName,
      status: s.status,
      blocks: s.blocks,
      result: s.result && { n: s.result.n, grandMean: s.result.grandMean, cv: s.result.cv, entryP: s.result.entryP, lsd: s.result.lsd, lettered: Boolean(s.result.means[0]?.letter) },
      problem: s.problem,
    })),
    combined: combined && {
      ...combined,
      cellMeans: toGrid(combined.cellMeans, (c) => c.siteId, (c) => c.entryId, (c) => c.mean),
    },
    germination: germination && {
      ...germination,
      bySite: toGrid(germination.bySite, (g) => g.siteId ?? 0, (g) => g.entryId, (g) => g.percent),
    },
  } as AnalysisPageView;
}

/** One site's section of the viewer's analysis; null when the site is not in it (not analysed, or not the viewer's). */
export function siteSectionOf(view: ViewerAnalysis, siteId: number): SiteSection | null {
  const site = view.perSite.find((s) => s.siteId === siteId);
  if (!site) return null;
  return { site, germination: (view.germination?.bySite ?? []).filter((g) => g.siteId === siteId) } as SiteSection;
}
