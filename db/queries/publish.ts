import "server-only";
import { and, asc, count, desc, eq, isNotNull, isNull, max, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { analysisExclusions, enrolments, publishedReports, sites, siteCooperators, submissions, traits, trials, users } from "../schema";
import { staffTrialScope } from "../access";
import { findStaffTrial, listEntriesWithLots, listTrialTraits } from "./trial-parts";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

/**
 * What a publication needs besides the analyses: trial facts, the sites' public descriptions (never
 * contacts), decoded entries with their seed lots, and the traits. Staff of the trial's program only.
 */
export async function getPublishContext(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return null;
  const trial = await findStaffTrial(viewer, trialId);
  if (!trial) return null;
  const [siteRows, entryRows, traitRows] = await Promise.all([
    db
      .select({
        id: sites.id,
        name: sites.name,
        kind: sites.kind,
        region: sites.region,
        growingSetup: sites.growingSetup,
        soil: sites.soil,
        irrigation: sites.irrigation,
        publicDescription: sites.publicDescription,
        sownOn: enrolments.sownOn,
        named: enrolments.namedInResults,
        joined: enrolments.id,
      })
      .from(enrolments)
      .innerJoin(sites, eq(sites.id, enrolments.siteId))
      .where(eq(enrolments.trialId, trialId))
      .orderBy(asc(sites.name)),
    listEntriesWithLots(trialId),
    listTrialTraits(trialId),
  ]);
  // Spelled out field by field: this shape is frozen into published snapshots.
  const entries = entryRows.map((e) => ({
    blindCode: e.blindCode,
    entryNumber: e.entryNumber,
    varietyId: e.varietyId,
    variety: e.variety,
    isCheck: e.isCheck,
    seedSource: e.source,
    lotCode: e.lotCode,
    labelGermination: e.labelGerminationPct,
    treated: e.treated ?? false,
  }));
  const traitList = traitRows.map((t) => ({ id: t.id, code: t.code, name: t.name, unit: t.unit, valueType: t.valueType, description: t.description }));
  return { trial, sites: siteRows, entries, traits: traitList };
}

/** Every published version of a trial, newest first, for the coordinator's publishing page. */
export async function listReportVersions(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return [];
  return db
    .select({
      id: publishedReports.id,
      version: publishedReports.version,
      traitId: publishedReports.traitId,
      changeNote: publishedReports.changeNote,
      publishedAt: publishedReports.publishedAt,
      unpublishedAt: publishedReports.unpublishedAt,
      unpublishReason: publishedReports.unpublishReason,
      publishedBy: users.name,
    })
    .from(publishedReports)
    .innerJoin(trials, eq(trials.id, publishedReports.trialId))
    .leftJoin(users, eq(users.id, publishedReports.publishedById))
    .where(and(eq(publishedReports.trialId, trialId), staffTrialScope(viewer)))
    .orderBy(desc(publishedReports.version));
}

/** The cooperators of a trial's enrolled sites, one row per site and grower (for publication notices). */
export async function listTrialCooperatorEmails(trialId: number): Promise<{ siteId: number; email: string; name: string }[]> {
  const rows = await db
    .selectDistinct({ siteId: enrolments.siteId, email: users.email, name: users.name })
    .from(enrolments)
    .innerJoin(siteCooperators, eq(siteCooperators.siteId, enrolments.siteId))
    .innerJoin(users, eq(users.id, siteCooperators.userId))
    .where(and(eq(enrolments.trialId, trialId), eq(users.active, true), isNotNull(users.passwordHash)));
  return rows;
}

/**
 * Every site enrolled in one of the viewer's programs' trials with its submission state, how many values
 * it recorded, and the trial's exclusions, for deciding which sites a publication includes. Given the
 * transaction, the submissions are read with a lock so a review decision cannot slip in before the commit.
 * Null when the trial is not the viewer's.
 */
export async function listPublishSites(viewer: Viewer, p: { trialId: number; tx?: Tx }) {
  if (!isStaff(viewer)) return null;
  const ex = p.tx ?? db;
  const [trial] = await ex.select({ id: trials.id }).from(trials).where(and(eq(trials.id, p.trialId), staffTrialScope(viewer)));
  if (!trial) return null;
  const siteQuery = ex
    .select({
      siteId: sites.id,
      siteName: sites.name,
      status: submissions.status,
      values: sql<number>`(SELECT COUNT(*) FROM observations o JOIN plots pl ON pl.id = o.plot_id WHERE pl.enrolment_id = ${enrolments.id})`.mapWith(Number),
    })
    .from(enrolments)
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .leftJoin(submissions, eq(submissions.enrolmentId, enrolments.id))
    .where(eq(enrolments.trialId, trial.id))
    .orderBy(asc(sites.name));
  const siteRows = p.tx ? await siteQuery.for("update") : await siteQuery;
  const exclusions = await ex
    .select({ siteId: analysisExclusions.siteId, plotId: analysisExclusions.plotId, traitId: analysisExclusions.traitId, category: analysisExclusions.category })
    .from(analysisExclusions)
    .where(eq(analysisExclusions.trialId, trial.id))
    .orderBy(asc(analysisExclusions.id));
  return { sites: siteRows.map((s) => ({ ...s, status: s.status ?? "draft" })), exclusions };
}

/**
 * The highest version published of one of the viewer's programs' trials (0 before the first); null when
 * the trial is not the viewer's. Given the transaction, it reads under the trial's row lock.
 */
export async function getLatestReportVersion(viewer: Viewer, p: { trialId: number; tx?: Tx }): Promise<number | null> {
  if (!isStaff(viewer)) return null;
  const [row] = await (p.tx ?? db)
    .select({ trialId: trials.id, latest: max(publishedReports.version) })
    .from(trials)
    .leftJoin(publishedReports, eq(publishedReports.trialId, trials.id))
    .where(and(eq(trials.id, p.trialId), staffTrialScope(viewer)))
    .groupBy(trials.id);
  return row ? (row.latest ?? 0) : null;
}

/** How many versions of one of the viewer's programs' trials are live (published and not withdrawn). */
export async function countLiveReports(viewer: Viewer, p: { trialId: number; tx?: Tx }): Promise<number> {
  if (!isStaff(viewer)) return 0;
  const [row] = await (p.tx ?? db)
    .select({ n: count() })
    .from(publishedReports)
    .innerJoin(trials, eq(trials.id, publishedReports.trialId))
    .where(and(eq(publishedReports.trialId, p.trialId), isNull(publishedReports.unpublishedAt), staffTrialScope(viewer)));
  return row?.n ?? 0;
}
