import "server-only";
import { and, desc, eq, inArray, isNull } from "drizzle-orm";
import { db } from "../index";
import { publishedReports, trials } from "../schema";
import type { PublishedSnapshot } from "@/lib/domain/publish/types";
import { toPublicSnapshot, type PublicSnapshot } from "@/lib/domain/publish/public-shape";

// Public reads come only from published snapshots, never from live tables, so nothing unpublished can
// leak and later data changes cannot alter what was published. Every snapshot is turned into its public
// shape as it is read (lib/domain/publish/public-shape), so what leaves here carries no internal state.

// A published version never changes, so its public shape can be kept for the life of the process.
const parsedSnapshots = new Map<number, PublicSnapshot>();

async function snapshotsByReportId(ids: number[]): Promise<Map<number, PublicSnapshot>> {
  const missing = ids.filter((id) => !parsedSnapshots.has(id));
  if (missing.length > 0) {
    const rows = await db.select({ id: publishedReports.id, snapshot: publishedReports.snapshot }).from(publishedReports).where(inArray(publishedReports.id, missing));
    for (const r of rows) parsedSnapshots.set(r.id, toPublicSnapshot(JSON.parse(r.snapshot) as PublishedSnapshot));
  }
  return new Map(ids.filter((id) => parsedSnapshots.has(id)).map((id) => [id, parsedSnapshots.get(id)!]));
}

export interface PublicVersion {
  version: number;
  publishedAt: Date;
  changeNote: string | null;
  withdrawn: boolean;
}

async function versionsOf(trialId: number): Promise<PublicVersion[]> {
  const rows = await db
    .select({ version: publishedReports.version, publishedAt: publishedReports.publishedAt, changeNote: publishedReports.changeNote, unpublishedAt: publishedReports.unpublishedAt })
    .from(publishedReports)
    .where(eq(publishedReports.trialId, trialId))
    .orderBy(desc(publishedReports.version));
  return rows.map((r) => ({ version: r.version, publishedAt: r.publishedAt, changeNote: r.changeNote, withdrawn: r.unpublishedAt !== null }));
}

export type PublicReport =
  | { kind: "published"; snapshot: PublicSnapshot; versions: PublicVersion[]; latestVersion: number }
  | { kind: "withdrawn"; title: string; code: string; reason: string; withdrawnAt: Date };

/**
 * The latest live version of a trial's results by trial code (or a given live version). A trial
 * whose results were all withdrawn gives the withdrawal notice; one never published gives null.
 */
export async function getPublicReport(code: string, version?: number): Promise<PublicReport | null> {
  const [trial] = await db.select({ id: trials.id, title: trials.title, code: trials.code }).from(trials).where(eq(trials.code, code));
  if (!trial) return null;
  const versions = await versionsOf(trial.id);
  if (versions.length === 0) return null;
  const live = versions.filter((v) => !v.withdrawn);
  if (live.length === 0) {
    if (version !== undefined) return null;
    const [last] = await db
      .select({ reason: publishedReports.unpublishReason, at: publishedReports.unpublishedAt })
      .from(publishedReports)
      .where(eq(publishedReports.trialId, trial.id))
      .orderBy(desc(publishedReports.unpublishedAt))
      .limit(1);
    return { kind: "withdrawn", title: trial.title, code: trial.code, reason: last?.reason ?? "", withdrawnAt: last?.at ?? new Date() };
  }
  const wanted = version ?? live[0]!.version;
  if (!live.some((v) => v.version === wanted)) return null;
  const [row] = await db
    .select({ id: publishedReports.id })
    .from(publishedReports)
    .where(and(eq(publishedReports.trialId, trial.id), eq(publishedReports.version, wanted), isNull(publishedReports.unpublishedAt)));
  if (!row) return null;
  const snapshot = (await snapshotsByReportId([row.id])).get(row.id);
  if (!snapshot) return null;
  return { kind: "published", snapshot, versions: live, latestVersion: live[0]!.version };
}

/** The latest live snapshot of every published trial. */
async function listLatestSnapshots(): Promise<PublicSnapshot[]> {
  const rows = await db
    .select({ id: publishedReports.id, trialId: publishedReports.trialId })
    .from(publishedReports)
    .where(isNull(publishedReports.unpublishedAt))
    .orderBy(desc(publishedReports.version));
  const latest = new Map<number, number>();
  for (const r of rows) if (!latest.has(r.trialId)) latest.set(r.trialId, r.id);
  const snapshots = await snapshotsByReportId([...latest.values()]);
  return [...latest.values()].map((id) => snapshots.get(id)).filter((x): x is PublicSnapshot => x !== undefined);
}

export interface PublicTrialCard {
  code: string;
  title: string;
  crop: string;
  cropGroup: string;
  season: string;
  year: number;
  sites: number;
  entries: string[];
  publishedAt: string;
  version: number;
  summary: string;
}

/** Published trials for the public index, filtered by free text, crop and season. */
export async function listPublicTrials(filters: { q?: string; crop?: string; season?: string }) {
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
    summary: s.summary[0] ?? "",
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
    trials: appearances.map(({ s, entry }) => ({
      code: s.trial.code,
      title: s.trial.title,
      season: s.trial.season,
      sites: s.sites.length,
      entriesInTrial: s.entries.length,
      isCheck: entry.isCheck,
      traits: s.results.map(({ result }) => {
        const block = result.combined ?? result.perSite.find((p) => p.result)?.result ?? null;
        const mine = block?.means.find((m) => m.blindCode === entry.blindCode) ?? null;
        return {
          trait: result.trait.analysedAs,
          mean: mine ? (mine.lsMean ?? mine.mean) : null,
          rank: mine?.rank ?? null,
          of: block?.means.length ?? 0,
          letter: mine?.letter ?? null,
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
    trials: appearances.map((s) => ({ code: s.trial.code, title: s.trial.title, season: s.trial.season })),
  };
}
