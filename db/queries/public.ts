import "server-only";
import { and, desc, eq, inArray, isNull } from "drizzle-orm";
import { db } from "../index";
import { publicGeneration, publishedReports, trials } from "../schema";

// Public reads come only from published snapshots, never from live tables, so nothing unpublished can
// leak and later data changes cannot alter what was published. These return stored rows; the public
// shape is made in server/publish/public-snapshots.ts before anything leaves the server.

export interface PublicVersion {
  version: number;
  publishedAt: Date;
  changeNote: string | null;
  withdrawn: boolean;
}

export type PublicReportRow =
  | { kind: "published"; reportId: number; versions: PublicVersion[]; latestVersion: number }
  | { kind: "withdrawn"; title: string; code: string; reason: string; withdrawnAt: Date };

async function versionsOf(trialId: number): Promise<PublicVersion[]> {
  const rows = await db
    .select({ version: publishedReports.version, publishedAt: publishedReports.publishedAt, changeNote: publishedReports.changeNote, unpublishedAt: publishedReports.unpublishedAt })
    .from(publishedReports)
    .where(eq(publishedReports.trialId, trialId))
    .orderBy(desc(publishedReports.version));
  return rows.map((r) => ({ version: r.version, publishedAt: r.publishedAt, changeNote: r.changeNote, withdrawn: r.unpublishedAt !== null }));
}

/**
 * Which stored version a public address shows, by trial code: the latest live version or the given live
 * one, with the live versions listed. A trial whose results were all withdrawn gives the withdrawal
 * notice; one never published (or an unknown or withdrawn version) gives null.
 */
export async function getPublicReportRow(p: { code: string; version?: number }): Promise<PublicReportRow | null> {
  const [trial] = await db.select({ id: trials.id, title: trials.title, code: trials.code }).from(trials).where(eq(trials.code, p.code));
  if (!trial) return null;
  const versions = await versionsOf(trial.id);
  if (versions.length === 0) return null;
  const live = versions.filter((v) => !v.withdrawn);
  if (live.length === 0) {
    if (p.version !== undefined) return null;
    const [last] = await db
      .select({ reason: publishedReports.unpublishReason, at: publishedReports.unpublishedAt })
      .from(publishedReports)
      .where(eq(publishedReports.trialId, trial.id))
      .orderBy(desc(publishedReports.unpublishedAt))
      .limit(1);
    return { kind: "withdrawn", title: trial.title, code: trial.code, reason: last?.reason ?? "", withdrawnAt: last?.at ?? new Date() };
  }
  const wanted = p.version ?? live[0]!.version;
  if (!live.some((v) => v.version === wanted)) return null;
  const [row] = await db
    .select({ id: publishedReports.id })
    .from(publishedReports)
    .where(and(eq(publishedReports.trialId, trial.id), eq(publishedReports.version, wanted), isNull(publishedReports.unpublishedAt)));
  if (!row) return null;
  return { kind: "published", reportId: row.id, versions: live, latestVersion: live[0]!.version };
}

/** The id of the latest live version of every published trial. */
export async function listLatestLiveReportIds(): Promise<number[]> {
  const rows = await db
    .select({ id: publishedReports.id, trialId: publishedReports.trialId })
    .from(publishedReports)
    .where(isNull(publishedReports.unpublishedAt))
    .orderBy(desc(publishedReports.version));
  const latest = new Map<number, number>();
  for (const r of rows) if (!latest.has(r.trialId)) latest.set(r.trialId, r.id);
  return [...latest.values()];
}

/** The stored snapshots (JSON text, the full record) of published versions, by report id. */
export async function listStoredSnapshots(reportIds: number[]): Promise<{ id: number; snapshot: string }[]> {
  if (reportIds.length === 0) return [];
  return db.select({ id: publishedReports.id, snapshot: publishedReports.snapshot }).from(publishedReports).where(inArray(publishedReports.id, reportIds));
}

const generationQuery = db.select({ stamp: publicGeneration.stamp }).from(publicGeneration).where(eq(publicGeneration.id, 1)).prepare();

/**
 * The stamp of what the public pages show now (a primary-key read): it changes with every publication,
 * withdrawal or public title change; "none" while the row does not exist.
 */
export async function readPublicGeneration(): Promise<string> {
  const [row] = await generationQuery.execute();
  return row?.stamp ?? "none";
}
