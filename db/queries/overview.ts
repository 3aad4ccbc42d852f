import "server-only";
import { and, asc, count, countDistinct, desc, eq, inArray, isNotNull, or, sql } from "drizzle-orm";
import { db } from "../index";
import {
  crops,
  enrolments,
  observations,
  plots,
  programs,
  seasons,
  siteCooperators,
  sites,
  submissions,
  trialEntries,
  trialTraits,
  traits,
  trials,
} from "../schema";
import { cooperatorEnrolmentScope, staffSiteScope, staffTrialScope } from "../access";
import { traitColumnFields } from "./observations";
import type { Viewer } from "@/lib/domain/viewer";

/** Trials in the coordinator's programs with entry and site counts, newest season first; only one season's when `seasonId` is given. */
export async function listTrialsForViewer(viewer: Viewer, filter: { seasonId?: number } = {}) {
  if (viewer.role === "cooperator") return [];
  const rows = await db
    .select({
      id: trials.id,
      code: trials.code,
      title: trials.title,
      status: trials.status,
      crop: crops.name,
      season: seasons.name,
      year: seasons.year,
      program: programs.name,
      entries: countDistinct(trialEntries.id),
      sites: countDistinct(enrolments.id),
    })
    .from(trials)
    .innerJoin(crops, eq(crops.id, trials.cropId))
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .innerJoin(programs, eq(programs.id, trials.programId))
    .leftJoin(trialEntries, eq(trialEntries.trialId, trials.id))
    .leftJoin(enrolments, eq(enrolments.trialId, trials.id))
    .where(and(staffTrialScope(viewer), filter.seasonId === undefined ? undefined : eq(trials.seasonId, filter.seasonId)))
    .groupBy(trials.id, crops.name, seasons.name, seasons.year, programs.name)
    .orderBy(desc(seasons.year), desc(seasons.id), asc(trials.code));
  return rows;
}

/**
 * What the due-and-late schedule is built from, for the enrolments of active trials the viewer may see:
 * the enrolments with plot counts, their trials' scheduled traits, and recorded counts per trait and day.
 */
export async function listScheduleRows(viewer: Viewer) {
  const scope = viewer.role === "cooperator" ? cooperatorEnrolmentScope(viewer) : staffTrialScope(viewer);
  const enrolmentRows = await db
    .select({
      enrolmentId: enrolments.id,
      trialId: trials.id,
      trialCode: trials.code,
      trialTitle: trials.title,
      siteId: sites.id,
      siteName: sites.name,
      sownOn: enrolments.sownOn,
      plotCount: count(plots.id),
      submissionStatus: submissions.status,
      submittedAt: submissions.submittedAt,
      reviewComment: submissions.reviewComment,
      openComments: sql<number>`(SELECT COUNT(*) FROM review_comments rc WHERE rc.submission_id = ${submissions.id} AND rc.resolved_at IS NULL)`.mapWith(Number),
    })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .leftJoin(plots, eq(plots.enrolmentId, enrolments.id))
    .leftJoin(submissions, eq(submissions.enrolmentId, enrolments.id))
    // In review, a site whose data are unfinished or returned still owes values, so it stays on the list.
    .where(and(scope, or(inArray(trials.status, ["open", "collecting"]), and(eq(trials.status, "analysing"), sql`COALESCE(${submissions.status}, 'draft') IN ('draft', 'returned')`))))
    .groupBy(enrolments.id, trials.id, sites.id, submissions.id)
    .orderBy(asc(trials.code), asc(sites.name));
  if (enrolmentRows.length === 0) return { enrolments: enrolmentRows, traits: [], recordedCounts: [] };

  const trialIds = [...new Set(enrolmentRows.map((r) => r.trialId))];
  const traitRows = await db
    .select({ trialId: trialTraits.trialId, ...traitColumnFields })
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .where(inArray(trialTraits.trialId, trialIds))
    .orderBy(asc(trialTraits.sortOrder));
  const recordedCounts = await db
    .select({ enrolmentId: plots.enrolmentId, traitId: observations.traitId, occasion: observations.occasion, n: count() })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(and(inArray(plots.enrolmentId, enrolmentRows.map((r) => r.enrolmentId)), or(isNotNull(observations.valueNumber), isNotNull(observations.valueDate), isNotNull(observations.missingReason))))
    .groupBy(plots.enrolmentId, observations.traitId, observations.occasion);
  return { enrolments: enrolmentRows, traits: traitRows, recordedCounts };
}

/** Sites the cooperator is attached to, with their public facts. */
export async function listMySites(viewer: Viewer) {
  if (viewer.role !== "cooperator") return [];
  return db
    .select({ id: sites.id, name: sites.name, region: sites.region, growingSetup: sites.growingSetup, kind: sites.kind })
    .from(sites)
    .innerJoin(siteCooperators, eq(siteCooperators.siteId, sites.id))
    .where(eq(siteCooperators.userId, viewer.id))
    .orderBy(asc(sites.name));
}

/** Sites of the viewer's programs for staff pick lists (ids and names only). */
export async function listSiteOptions(viewer: Viewer) {
  if (viewer.role === "cooperator") return [];
  return db.select({ id: sites.id, name: sites.name }).from(sites).where(staffSiteScope(viewer)).orderBy(asc(sites.name));
}

/** Published trials with results from the cooperator's own sites, newest first, for links to the public pages. */
export async function listMyPublishedTrials(viewer: Viewer) {
  if (viewer.role !== "cooperator") return [];
  return db
    .selectDistinct({ code: trials.code, title: trials.title, siteName: sites.name })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .where(and(cooperatorEnrolmentScope(viewer), eq(trials.status, "published")))
    .orderBy(asc(trials.code), asc(sites.name));
}
