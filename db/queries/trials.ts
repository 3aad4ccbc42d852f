import "server-only";
import type { KitEntry } from "@/lib/domain/design/kits";
import { and, asc, count, eq, isNull, or, sql } from "drizzle-orm";
import { db } from "../index";
import { crops, enrolments, observations, plots, programs, seasons, seedLots, sites, trialEntries, traits, trials, users, varieties } from "../schema";
import { cooperatorEnrolmentScope, programScope, staffTrialScope, trialProgress } from "../access";
import { findStaffTrial, listEntriesWithLots, listTrialTraits, plotLayoutFields } from "./trial-parts";
import type { Viewer } from "@/lib/domain/viewer";
import { canSeeBlindKey, isStaff } from "@/lib/domain/permissions";

/**
 * Open seasons of the viewer's programs, the shared crops, and the built-in traits with the viewer's programs'
 * own, for the trial form (staff only). A trial may record only its own program's custom traits; the
 * save checks that.
 */
export async function getTrialFormOptions(viewer: Viewer) {
  if (!isStaff(viewer)) return null;
  const seasonRows = await db
    .select({ id: seasons.id, name: seasons.name, year: seasons.year, program: programs.name })
    .from(seasons)
    .innerJoin(programs, eq(programs.id, seasons.programId))
    // A closed season takes no new trials, so the form offers only open ones.
    .where(and(programScope(viewer, seasons.programId), isNull(seasons.closedAt)))
    .orderBy(sql`${seasons.year} desc`, asc(seasons.name));
  const cropRows = await db.select({ id: crops.id, name: crops.name }).from(crops).orderBy(asc(crops.name));
  const traitRows = await db
    .select({ id: traits.id, name: traits.name, unit: traits.unit, valueType: traits.valueType, dueNote: traits.dueNote, dueDaysAfterSowing: traits.dueDaysAfterSowing })
    .from(traits)
    .where(or(eq(traits.builtIn, true), programScope(viewer, traits.programId)))
    .orderBy(asc(traits.name));
  return { seasons: seasonRows, crops: cropRows, traits: traitRows };
}

/**
 * One trial for staff: design, status inputs, entries (with the blind-code key), traits and enrolled
 * sites with their layout state. Null when the trial is not in the viewer's programs.
 */
export async function getTrialDetail(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return null;
  const trial = await findStaffTrial(viewer, trialId);
  if (!trial) return null;
  const [entryRows, traitRows, siteRows, progress] = await Promise.all([
    listEntriesWithLots(trial.id),
    listTrialTraits(trial.id),
    db
      .select({
        enrolmentId: enrolments.id,
        siteId: sites.id,
        site: sites.name,
        region: sites.region,
        growingSetup: sites.growingSetup,
        cooperator: users.name,
        cooperatorInvited: sql<boolean>`${users.passwordHash} IS NULL`,
        sownOn: enrolments.sownOn,
        randomSeed: enrolments.randomSeed,
        randomisedAt: enrolments.randomisedAt,
        namedInResults: enrolments.namedInResults,
        plots: sql<number>`(SELECT COUNT(*) FROM ${plots} WHERE ${plots.enrolmentId} = ${enrolments.id})`.mapWith(Number),
        observations: sql<number>`(SELECT COUNT(*) FROM ${observations} INNER JOIN ${plots} ON ${plots.id} = ${observations.plotId} WHERE ${plots.enrolmentId} = ${enrolments.id})`.mapWith(Number),
      })
      .from(enrolments)
      .innerJoin(sites, eq(sites.id, enrolments.siteId))
      .leftJoin(users, eq(users.id, enrolments.cooperatorId))
      .where(eq(enrolments.trialId, trial.id))
      .orderBy(asc(enrolments.id)),
    trialProgress(db, trial.id),
  ]);
  return { trial, entries: entryRows, traits: traitRows, sites: siteRows, progress };
}
export type TrialDetail = NonNullable<Awaited<ReturnType<typeof getTrialDetail>>>;

/** The program's varieties of the trial's crop with their seed lots, for the add-entry form (staff only). */
export async function listEntryOptions(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return [];
  const rows = await db
    .select({ varietyId: varieties.id, variety: varieties.name, seedLotId: seedLots.id, source: seedLots.source, lotCode: seedLots.lotCode, treated: seedLots.treated })
    .from(trials)
    .innerJoin(varieties, and(eq(varieties.cropId, trials.cropId), eq(varieties.programId, trials.programId)))
    .leftJoin(seedLots, eq(seedLots.varietyId, varieties.id))
    .where(and(eq(trials.id, trialId), staffTrialScope(viewer)))
    .orderBy(asc(varieties.name), asc(seedLots.lotCode));
  const byVariety = new Map<number, { id: number; name: string; lots: { id: number; label: string; treated: boolean }[] }>();
  for (const r of rows) {
    const v = byVariety.get(r.varietyId) ?? { id: r.varietyId, name: r.variety, lots: [] };
    if (r.seedLotId !== null) v.lots.push({ id: r.seedLotId, label: `${r.source} · ${r.lotCode}${r.treated ? " (treated)" : ""}`, treated: !!r.treated });
    byVariety.set(r.varietyId, v);
  }
  return [...byVariety.values()];
}

/** The program's sites not yet enrolled in the trial, for the enrol form (staff only). */
export async function listEnrolableSites(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return [];
  return db
    .select({ id: sites.id, name: sites.name, region: sites.region })
    .from(trials)
    .innerJoin(sites, eq(sites.programId, trials.programId))
    .where(and(eq(trials.id, trialId), staffTrialScope(viewer), sql`${sites.id} NOT IN (SELECT ${enrolments.siteId} FROM ${enrolments} WHERE ${enrolments.trialId} = ${trialId})`))
    .orderBy(asc(sites.name));
}

export interface LayoutPlot {
  id: number;
  plotCode: string;
  block: number;
  position: number;
  tray: number | null;
  traySlot: number | null;
  blindCode: string;
  /** Only for viewers allowed the blind-code key; null otherwise. */
  variety: string | null;
  isCheck: boolean | null;
  /** treated seed in this plot's packet: shown to everyone, for their safety */
  treated: boolean;
}

/**
 * Everything the printables and the layout page need for one site. Staff see their programs' sites;
 * a cooperator only their own sites, and only blind codes (never variety names or seed sources).
 * Null when the viewer may not see it.
 */
export async function getSiteLayout(viewer: Viewer, p: { trialId: number; siteId: number }) {
  const scope = viewer.role === "cooperator" ? cooperatorEnrolmentScope(viewer) : staffTrialScope(viewer);
  const [row] = await db
    .select({
      enrolmentId: enrolments.id,
      sownOn: enrolments.sownOn,
      randomSeed: enrolments.randomSeed,
      randomisedAt: enrolments.randomisedAt,
      trialId: trials.id,
      code: trials.code,
      title: trials.title,
      status: trials.status,
      design: trials.design,
      blocks: trials.blocks,
      plotUnit: trials.plotUnit,
      plotSize: trials.plotSize,
      seedsPerCell: trials.seedsPerCell,
      protocol: trials.protocol,
      crop: crops.name,
      season: seasons.name,
      siteId: sites.id,
      siteName: sites.name,
      region: sites.region,
      growingSetup: sites.growingSetup,
      printLocale: sites.printLocale,
    })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(crops, eq(crops.id, trials.cropId))
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .where(and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId), scope));
  if (!row) return null;
  const showKey = viewer.role !== "cooperator" && canSeeBlindKey(viewer, row);
  const plotRows = await db
    .select({
      ...plotLayoutFields,
      variety: varieties.name,
      isCheck: trialEntries.isCheck,
      treated: seedLots.treated,
    })
    .from(plots)
    .innerJoin(trialEntries, eq(trialEntries.id, plots.entryId))
    .innerJoin(varieties, eq(varieties.id, trialEntries.varietyId))
    .leftJoin(seedLots, eq(seedLots.id, trialEntries.seedLotId))
    .where(eq(plots.enrolmentId, row.enrolmentId))
    .orderBy(asc(plots.block), asc(plots.position));
  const traitRows = await listTrialTraits(row.trialId);
  // Which codes are treated is safety information every viewer gets; the seed lot is for the staff who pack kits.
  const entryRows = await db
    .select({ blindCode: trialEntries.blindCode, treated: seedLots.treated, source: seedLots.source, lotCode: seedLots.lotCode })
    .from(trialEntries)
    .leftJoin(seedLots, eq(seedLots.id, trialEntries.seedLotId))
    .where(eq(trialEntries.trialId, row.trialId))
    .orderBy(asc(trialEntries.blindCode));
  const kitEntries: KitEntry[] = entryRows.map((e) => ({
    blindCode: e.blindCode,
    treated: !!e.treated,
    lot: viewer.role !== "cooperator" && e.lotCode ? `${e.source ?? "source not recorded"} · ${e.lotCode}` : null,
  }));
  const layoutPlots: LayoutPlot[] = plotRows.map((r) => ({
    id: r.id,
    plotCode: r.plotCode,
    block: r.block,
    position: r.position,
    tray: r.tray,
    traySlot: r.traySlot,
    blindCode: r.blindCode,
    variety: showKey ? r.variety : null,
    isCheck: showKey ? r.isCheck : null,
    treated: !!r.treated,
  }));
  return { ...row, showKey, plots: layoutPlots, traits: traitRows, entries: kitEntries, hasTreatedSeed: kitEntries.some((e) => e.treated) };
}
export type SiteLayout = NonNullable<Awaited<ReturnType<typeof getSiteLayout>>>;

/** One plot for its data-entry page: staff of the trial's program or a cooperator of the plot's site. */
export async function getPlotForViewer(viewer: Viewer, plotId: number) {
  const scope = viewer.role === "cooperator" ? cooperatorEnrolmentScope(viewer) : staffTrialScope(viewer);
  const [row] = await db
    .select({
      ...plotLayoutFields,
      trialId: trials.id,
      trialTitle: trials.title,
      trialCode: trials.code,
      plotUnit: trials.plotUnit,
      siteId: sites.id,
      siteName: sites.name,
    })
    .from(plots)
    .innerJoin(enrolments, eq(enrolments.id, plots.enrolmentId))
    .innerJoin(trials, eq(trials.id, plots.trialId))
    .innerJoin(sites, eq(sites.id, plots.siteId))
    .innerJoin(trialEntries, eq(trialEntries.id, plots.entryId))
    .where(and(eq(plots.id, plotId), scope));
  return row ?? null;
}

/** A cooperator's enrolments with a layout, for links to their printables. */
export async function listMyLayouts(viewer: Viewer) {
  if (viewer.role !== "cooperator") return [];
  return db
    .select({ trialId: trials.id, trialTitle: trials.title, siteId: sites.id, siteName: sites.name })
    .from(enrolments)
    .innerJoin(trials, eq(trials.id, enrolments.trialId))
    .innerJoin(sites, eq(sites.id, enrolments.siteId))
    .where(and(cooperatorEnrolmentScope(viewer), sql`${enrolments.randomisedAt} IS NOT NULL`))
    .orderBy(asc(trials.title), asc(sites.name));
}


/**
 * Where a trial sits in its line across seasons: the trial it was planned from and the ones planned from
 * it, plus the open seasons of its program a next trial can go in. Null when the trial is not the viewer's.
 */
export async function getTrialLineage(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return null;
  const [self] = await db.select({ previousTrialId: trials.previousTrialId, programId: trials.programId }).from(trials).where(and(eq(trials.id, trialId), staffTrialScope(viewer)));
  if (!self) return null;
  const [previous, next, seasonRows] = await Promise.all([
    self.previousTrialId === null
      ? Promise.resolve([])
      : db.select({ id: trials.id, code: trials.code, title: trials.title }).from(trials).where(and(eq(trials.id, self.previousTrialId), staffTrialScope(viewer))),
    db.select({ id: trials.id, code: trials.code, title: trials.title }).from(trials).where(and(eq(trials.previousTrialId, trialId), staffTrialScope(viewer))).orderBy(asc(trials.code)),
    db.select({ id: seasons.id, name: seasons.name, year: seasons.year }).from(seasons).where(and(eq(seasons.programId, self.programId), isNull(seasons.closedAt))).orderBy(sql`${seasons.year} desc`, asc(seasons.name)),
  ]);
  return { previous: previous[0] ?? null, next, seasons: seasonRows };
}
