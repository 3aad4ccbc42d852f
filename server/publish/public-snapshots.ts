import "server-only";
import type { Locale } from "@/lib/domain/vocabulary/enums";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { summariseForGrowers } from "@/lib/domain/publish/summary";
import { getPublicReportRow, listLatestLiveReportIds, listStoredSnapshots, type PublicVersion } from "@/db/queries/public";
import { parsePublishedAddress } from "@/lib/domain/publish/address";
import { toPublicSnapshot, type PublicSnapshot } from "@/lib/domain/publish/public-shape";
import { publishedUnit } from "@/lib/domain/publish/open-data";
import { extremeWord, inStatedOrder, leaderHeading, rankedValue } from "@/lib/domain/analysis/ranking";
import { valueWithUnit } from "@/lib/domain/analysis/format";
import type { PublishedSnapshot } from "@/lib/domain/publish/types";
import type { PublicTrialCard } from "@/lib/domain/publish/public-view";
import { AppError } from "@/lib/errors";

// Everything public (pages, /api/public/trials/..., the downloads and the PDF) reads published versions
// through here. Each stored snapshot is turned into its public shape (lib/domain/publish/public-shape) as
// it is read, so what leaves the server carries no internal state, whatever version of the format stored it.

// A published version never changes, so its public shape can be kept for the life of the process.
const publicShapes = new Map<number, PublicSnapshot>();

async function publicSnapshotsById(reportIds: number[]): Promise<Map<number, PublicSnapshot>> {
  const missing = reportIds.filter((id) => !publicShapes.has(id));
  for (const row of await listStoredSnapshots(missing)) publicShapes.set(row.id, toPublicSnapshot(JSON.parse(row.snapshot) as PublishedSnapshot));
  return new Map(reportIds.filter((id) => publicShapes.has(id)).map((id) => [id, publicShapes.get(id)!]));
}

export type { PublicVersion };

export type PublicReport =
  | { kind: "published"; snapshot: PublicSnapshot; versions: PublicVersion[]; latestVersion: number }
  | { kind: "withdrawn"; title: string; code: string; reason: string; withdrawnAt: Date };

/**
 * The latest live version of a trial's results by trial code (or a given live version). A trial
 * whose results were all withdrawn gives the withdrawal notice; one never published gives null.
 */
export async function getPublicReport(code: string, version?: number): Promise<PublicReport | null> {
  const row = await getPublicReportRow({ code, version });
  if (!row || row.kind === "withdrawn") return row;
  const snapshot = (await publicSnapshotsById([row.reportId])).get(row.reportId);
  if (!snapshot) return null;
  return { kind: "published", snapshot, versions: row.versions, latestVersion: row.latestVersion };
}

/** The report a public address asks for, from the raw ?version= value; null when the address is malformed. */
export async function getPublicReportAt(code: string, version: string | null | undefined): Promise<PublicReport | null> {
  const address = parsePublishedAddress(code, version);
  return address && getPublicReport(address.code, address.version);
}

/**
 * Resolves the snapshot a public download asks for (latest live version, or ?version=N). Anything
 * not published, withdrawn or malformed is a plain 404, so guessed codes reveal nothing.
 */
export async function requirePublishedSnapshot(code: string, request: Request): Promise<PublicSnapshot> {
  return (await requirePublishedReport(code, request)).snapshot;
}

/** Like `requirePublishedSnapshot`, with the trial's latest live version number (for the open data API). */
export async function requirePublishedReport(code: string, request: Request): Promise<{ snapshot: PublicSnapshot; latestVersion: number }> {
  const report = await getPublicReportAt(code, new URL(request.url).searchParams.get("version"));
  if (!report || report.kind !== "published") throw new AppError("not_found", "There are no published results at this address.");
  return { snapshot: report.snapshot, latestVersion: report.latestVersion };
}

/** A download name such as "TV26-LET-results-v2.pdf". */
export const downloadName = (s: PublicSnapshot, suffix: string) => `${s.trial.code}-results-v${s.version}.${suffix}`;

/** The latest live snapshot of every published trial. */
export async function listLatestSnapshots(): Promise<PublicSnapshot[]> {
  const ids = await listLatestLiveReportIds();
  const snapshots = await publicSnapshotsById(ids);
  return ids.map((id) => snapshots.get(id)).filter((x): x is PublicSnapshot => x !== undefined);
}

export type { PublicTrialCard };

/**
 * Published trials for the public index, filtered by free text, crop and season. Each card's summary line is
 * the published one in English, or the same sentence worded from the published figures in `locale`.
 */
export async function listPublicTrials(filters: { q?: string; crop?: string; season?: string }, locale: Locale = "en") {
  const snapshots = await listLatestSnapshots();
  const cards: PublicTrialCard[] = snapshots.map((s) => ({
    code: s.trial.code,
    title: s.trial.title,
    crop: s.trial.crop,
    cropGroup: s.trial.cropGroup,
    season: s.trial.season,
    year: s.trial.year,
    sites: s.sites.length,
    entries: s.entries.map((e) => e.variety),
    publishedAt: s.publishedAt,
    version: s.version,
    summary: (locale === "en" ? s.summary : summariseForGrowers(s.results.map((r) => r.result), translatorFor(locale)))[0] ?? "",
  }));
  const q = filters.q?.trim().toLowerCase();
  const filtered = cards.filter(
    (c) =>
      (!filters.crop || c.crop === filters.crop) &&
      (!filters.season || c.season === filters.season) &&
      (!q || [c.title, c.crop, c.season, c.code, ...c.entries].some((x) => x.toLowerCase().includes(q))),
  );
  filtered.sort((a, b) => b.year - a.year || a.title.localeCompare(b.title));
  return {
    trials: filtered,
    crops: [...new Set(cards.map((c) => c.crop))].sort(),
    seasons: [...new Set(cards.map((c) => c.season))].sort(),
  };
}

/** A variety's results across published trials (only what those snapshots show). */
export async function getPublicVariety(varietyId: number) {
  const snapshots = await listLatestSnapshots();
  const appearances = snapshots
    .map((s) => ({ s, entry: s.entries.find((e) => e.varietyId === varietyId) }))
    .filter((x): x is { s: PublicSnapshot; entry: PublicSnapshot["entries"][number] } => x.entry !== undefined);
  if (appearances.length === 0) return null;
  return {
    name: appearances[0]!.entry.variety,
    crop: appearances[0]!.s.trial.crop,
    // oldest season first, so the % of check reads as a history
    trials: [...appearances].sort((a, b) => a.s.trial.year - b.s.trial.year || a.s.publishedAt.localeCompare(b.s.publishedAt)).map(({ s, entry }) => ({
      code: s.trial.code,
      title: s.trial.title,
      season: s.trial.season,
      year: s.trial.year,
      sites: s.sites.length,
      entriesInTrial: s.entries.length,
      isCheck: entry.isCheck,
      traits: s.results.map(({ result }) => {
        const block = result.combined ?? result.perSite.find((p) => p.result)?.result ?? null;
        const mine = block?.means.find((m) => m.blindCode === entry.blindCode) ?? null;
        return {
          trait: result.trait.analysedAs,
          traitName: result.trait.name,
          traitCode: result.trait.code,
          unit: publishedUnit(result.trait),
          valueType: result.trait.valueType,
          computation: result.trait.computation,
          betterWhen: result.trait.betterWhen,
          mean: mine ? (mine.lsMean ?? mine.mean) : null,
          rank: mine?.rank ?? null,
          of: block?.means.length ?? 0,
          letter: mine?.letter ?? null,
          percentOfCheck: mine?.percentOfCheck ?? null,
          beyondLsd: mine?.beyondLsd ?? null,
        };
      }),
    })),
  };
}

/** A site's public description, only when it took part in a published trial. */
export async function getPublicSite(siteId: number) {
  const snapshots = await listLatestSnapshots();
  const appearances = snapshots.filter((s) => s.sites.some((x) => x.id === siteId));
  if (appearances.length === 0) return null;
  const site = appearances[0]!.sites.find((x) => x.id === siteId)!;
  return {
    site: { name: site.name, kind: site.kind, region: site.region, growingSetup: site.growingSetup, soil: site.soil, irrigation: site.irrigation, publicDescription: site.publicDescription },
    trials: appearances.map((s) => ({
      code: s.trial.code,
      title: s.trial.title,
      season: s.trial.season,
      inResults: !s.coverage.notIncluded.some((x) => x.name === site.name),
      leaders: leadersAt(s, site.name),
    })),
  };
}

/**
 * Per trait, the variety that came first at one site: best for the trait's direction, or plainly the lowest
 * (earliest) when the trait has none; with the site's variety test, since a leader among equals means little.
 */
function leadersAt(s: PublicSnapshot, siteName: string) {
  return s.results.flatMap(({ result }) => {
    const block = result.perSite.find((p) => p.siteName === siteName)?.result;
    const first = block ? inStatedOrder(block.means)[0] : undefined;
    if (!first) return [];
    return [
      {
        trait: result.trait.analysedAs,
        // a site whose varieties did not differ clearly has no leader worth naming
        clear: block!.entryP !== null && block!.entryP < 0.05,
        entryP: block!.entryP,
        heading: leaderHeading(result.trait),
        variety: first.varietyName ?? first.blindCode,
        value: valueWithUnit(result.trait, rankedValue(first)),
        // what a page in another language words again: the trait, the figure and which end came first
        traitShape: result.trait,
        rawValue: rankedValue(first),
        word: extremeWord(result.trait, "first"),
        percentOfCheck: first.percentOfCheck,
        isCheck: first.isCheck,
      },
    ];
  });
}
