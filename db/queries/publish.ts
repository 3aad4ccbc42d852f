import "server-only";
import { and, asc, desc, eq, isNotNull } from "drizzle-orm";
import { db } from "../index";
import {
  crops,
  enrolments,
  programs,
  publishedReports,
  seasons,
  seedLots,
  sites,
  siteCooperators,
  trialEntries,
  trialTraits,
  traits,
  trials,
  users,
  varieties,
} from "../schema";
import { staffTrialScope } from "../access";
import type { Viewer } from "@/lib/auth/types";
import { isStaff } from "@/lib/auth/permissions";

/**
 * What a publication needs besides the analyses: trial facts, the sites' public descriptions (never
 * contacts), decoded entries with their seed lots, and the traits. Staff of the trial's program only.
 */
export async function getPublishContext(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return null;
  const [trial] = await db
    .select({
      id: trials.id,
      code: trials.code,
      title: trials.title,
      status: trials.status,
      purpose: trials.purpose,
      design: trials.design,
      blocks: trials.blocks,
      plotUnit: trials.plotUnit,
      plotSize: trials.plotSize,
      protocol: trials.protocol,
      crop: crops.name,
      cropGroup: crops.cropGroup,
      season: seasons.name,
      year: seasons.year,
      program: programs.name,
    })
    .from(trials)
    .innerJoin(crops, eq(crops.id, trials.cropId))
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .innerJoin(programs, eq(programs.id, trials.programId))
    .where(and(eq(trials.id, trialId), staffTrialScope(viewer)));
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
      })
      .from(enrolments)
      .innerJoin(sites, eq(sites.id, enrolments.siteId))
      .where(eq(enrolments.trialId, trialId))
      .orderBy(asc(sites.name)),
    db
      .select({
        blindCode: trialEntries.blindCode,
        entryNumber: trialEntries.entryNumber,
        varietyId: varieties.id,
        variety: varieties.name,
        isCheck: trialEntries.isCheck,
        seedSource: seedLots.source,
        lotCode: seedLots.lotCode,
        labelGermination: seedLots.labelGerminationPct,
        treated: seedLots.treated,
      })
      .from(trialEntries)
      .innerJoin(varieties, eq(varieties.id, trialEntries.varietyId))
      .leftJoin(seedLots, eq(seedLots.id, trialEntries.seedLotId))
      .where(eq(trialEntries.trialId, trialId))
      .orderBy(asc(trialEntries.entryNumber)),
    db
      .select({ id: traits.id, code: traits.code, name: traits.name, unit: traits.unit, valueType: traits.valueType, description: traits.description })
      .from(trialTraits)
      .innerJoin(traits, eq(traits.id, trialTraits.traitId))
      .where(eq(trialTraits.trialId, trialId))
      .orderBy(asc(trialTraits.sortOrder)),
  ]);
  return { trial, sites: siteRows, entries: entryRows.map((e) => ({ ...e, treated: e.treated ?? false })), traits: traitRows };
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

/** E-mail addresses of the cooperators of a trial's enrolled sites (for publication notices). */
export async function listTrialCooperatorEmails(trialId: number): Promise<{ email: string; name: string }[]> {
  const rows = await db
    .selectDistinct({ email: users.email, name: users.name })
    .from(enrolments)
    .innerJoin(siteCooperators, eq(siteCooperators.siteId, enrolments.siteId))
    .innerJoin(users, eq(users.id, siteCooperators.userId))
    .where(and(eq(enrolments.trialId, trialId), eq(users.active, true), isNotNull(users.passwordHash)));
  return rows;
}
