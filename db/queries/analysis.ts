import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import type { RowDataPacket } from "mysql2";
import { db, pool } from "../index";
import {
  analysisExclusions,
  crops,
  enrolments,
  observations,
  plots,
  seasons,
  seedLots,
  sites,
  submissions,
  trialEntries,
  trialTraits,
  traits,
  trials,
  users,
  varieties,
} from "../schema";
import { cooperatorEnrolmentScope, staffTrialScope, staffVarietyScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import type { AnalysisInput, InputObservation, InputPlot, InputTrait } from "@/lib/domain/analysis/types";
import type { BetterWhen, TrialStatus } from "@/lib/domain/vocabulary/enums";
import { SEED_COUNT_TRAITS } from "@/lib/domain/vocabulary/traits";

// Staff read every site of their programs' trials; a cooperator reads only their own sites, and only
// once a coordinator has shared that site's results (enrolments.results_shared), with blind codes only.

interface ScopedTrial {
  id: number;
  code: string;
  title: string;
  crop: string;
  blocks: number;
  status: TrialStatus;
  /** sites the viewer may see; null = every site (staff) */
  siteIds: number[] | null;
}

async function scopedTrial(viewer: Viewer, trialId: number): Promise<ScopedTrial | null> {
  const columns = { id: trials.id, code: trials.code, title: trials.title, crop: crops.name, blocks: trials.blocks, status: trials.status };
  if (isStaff(viewer)) {
    const [trial] = await db.select(columns).from(trials).innerJoin(crops, eq(crops.id, trials.cropId)).where(and(eq(trials.id, trialId), staffTrialScope(viewer)));
    return trial ? { ...trial, siteIds: null } : null;
  }
  if (viewer.role !== "cooperator") return null;
  const shared = await db
    .select({ siteId: enrolments.siteId })
    .from(enrolments)
    .where(and(eq(enrolments.trialId, trialId), eq(enrolments.resultsShared, true), cooperatorEnrolmentScope(viewer)));
  if (shared.length === 0) return null;
  const [trial] = await db.select(columns).from(trials).innerJoin(crops, eq(crops.id, trials.cropId)).where(eq(trials.id, trialId));
  return trial ? { ...trial, siteIds: shared.map((r) => r.siteId) } : null;
}

/** Restricts a plots/enrolments query to the viewer's visible sites. */
const siteFilter = (trial: ScopedTrial, column: typeof plots.siteId | typeof enrolments.siteId) => (trial.siteIds === null ? sql`true` : inArray(column, trial.siteIds));

/**
 * What one analysis request may read of a trial, checked once: the trial as the viewer may see it (sites in
 * scope) and its traits in display order. Only getAnalysisAccess makes one, so a holder has passed the check;
 * the reads below take it instead of checking again.
 */
declare const checkedAccess: unique symbol;
export interface AnalysisAccess {
  /** unnamed outside this module, so no other code can make an access without the check (short of a cast) */
  readonly [checkedAccess]: true;
  readonly viewer: Viewer;
  readonly trial: Readonly<ScopedTrial>;
  readonly traits: readonly InputTrait[];
}

/**
 * The access check of an analysis and the trial's traits, read side by side (the traits are handed out only
 * when the check passes); null when the trial is not the viewer's.
 */
export async function getAnalysisAccess(viewer: Viewer, trialId: number): Promise<AnalysisAccess | null> {
  const [trial, traitRows] = await Promise.all([scopedTrial(viewer, trialId), loadTraits(trialId)]);
  return trial ? ({ viewer, trial, traits: traitRows } as unknown as AnalysisAccess) : null;
}

/**
 * The status of a trial whose analysis the viewer may read (staff of its program, or a cooperator with a
 * shared site); null otherwise. The server decides from it whether the blind key may be read.
 */
export async function getAnalysisTrialStatus(viewer: Viewer, trialId: number): Promise<TrialStatus | null> {
  return (await scopedTrial(viewer, trialId))?.status ?? null;
}

/** The trial's recorded traits in display order (staff only); null when the trial is not the viewer's. */
export async function listAnalysisTraits(viewer: Viewer, trialId: number): Promise<(InputTrait & { recorded: number })[] | null> {
  const access = await getAnalysisAccess(viewer, trialId);
  return access && countRecordedValues(access);
}

/** Each of the trial's traits with how many plots have a value for it (a count reads every observation of the trial). */
export async function countRecordedValues(access: AnalysisAccess): Promise<(InputTrait & { recorded: number })[]> {
  const { trial } = access;
  const counts = await db
    .select({ traitId: observations.traitId, n: sql<number>`COUNT(*)`.mapWith(Number) })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(and(eq(plots.trialId, trial.id), siteFilter(trial, plots.siteId), sql`(${observations.valueNumber} IS NOT NULL OR ${observations.valueDate} IS NOT NULL)`))
    .groupBy(observations.traitId);
  const byTrait = new Map(counts.map((c) => [c.traitId, c.n]));
  return access.traits.map((t) => ({ ...t, recorded: byTrait.get(t.id) ?? 0 }));
}

function loadTraits(trialId: number): Promise<InputTrait[]> {
  return db
    .select({
      id: traits.id,
      code: traits.code,
      name: traits.name,
      unit: traits.unit,
      valueType: traits.valueType,
      computation: traits.computation,
      betterWhen: sql<BetterWhen>`coalesce(${trialTraits.betterWhen}, ${traits.betterWhen})`,
    })
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .where(eq(trialTraits.trialId, trialId))
    .orderBy(asc(trialTraits.sortOrder), asc(traits.id));
}

/**
 * A select's rows read through the pool as arrays and shaped by `row` (given the columns in the select's order).
 * For the analysis's two large reads (a 50-site trial has 8,000 plots and 24,000 values): there drizzle's
 * per-value cast callback and its row mapping cost more than MariaDB's own work. Values come as the pool's
 * settings give them (db/client.ts: numbers for DECIMAL, ISO strings for DATE), as drizzle maps these columns.
 */
async function arrayRows<T>(query: { toSQL(): { sql: string; params: unknown[] } }, row: (values: unknown[]) => T): Promise<T[]> {
  const { sql: text, params } = query.toSQL();
  const [rows] = await pool.query<RowDataPacket[][]>({ sql: text, values: params, rowsAsArray: true });
  return rows.map(row);
}

/** The analysis input as read; an exclusion's private note is there for the program's staff only. */
export type AnalysisInputRows = AnalysisInput;

/**
 * Everything one trait's analysis needs: entries, sites with sowing dates and submission status, plots,
 * the trait's and the seed counts' observations, and exclusions, for the sites the viewer may see. With
 * `includeKey` false nothing that decodes a blind code leaves here: no variety names or ids, seed lots,
 * check flags or label germination. Exclusions carry their public category; the private note and who
 * recorded it only for staff. The access is checked already (getAnalysisAccess).
 */
export async function readAnalysisInput(access: AnalysisAccess, p: { traitId: number; includeKey: boolean }): Promise<AnalysisInputRows> {
  const { trial } = access;
  const trialId = trial.id;
  const traitRows = [...access.traits];
  const wanted = traitRows.filter((t) => t.id === p.traitId || (SEED_COUNT_TRAITS as readonly string[]).includes(t.code)).map((t) => t.id);
  const [entryRows, siteRows, plotRows, obsRows, exclusionRows] = await Promise.all([
    db
      .select({
        id: trialEntries.id,
        blindCode: trialEntries.blindCode,
        entryNumber: trialEntries.entryNumber,
        varietyName: varieties.name,
        varietyId: varieties.id,
        isCheck: trialEntries.isCheck,
        labelGermination: seedLots.labelGerminationPct,
        seedSource: seedLots.source,
        lotCode: seedLots.lotCode,
      })
      .from(trialEntries)
      .innerJoin(varieties, eq(varieties.id, trialEntries.varietyId))
      .leftJoin(seedLots, eq(seedLots.id, trialEntries.seedLotId))
      .where(eq(trialEntries.trialId, trialId))
      .orderBy(asc(trialEntries.entryNumber)),
    db
      .select({ id: sites.id, name: sites.name, sownOn: enrolments.sownOn, transplantedOn: enrolments.transplantedOn, status: submissions.status, resultsShared: enrolments.resultsShared })
      .from(enrolments)
      .innerJoin(sites, eq(sites.id, enrolments.siteId))
      .leftJoin(submissions, eq(submissions.enrolmentId, enrolments.id))
      .where(and(eq(enrolments.trialId, trialId), siteFilter(trial, enrolments.siteId)))
      .orderBy(asc(enrolments.id)),
    arrayRows(
      db
        .select({ id: plots.id, plotCode: plots.plotCode, siteId: plots.siteId, entryId: plots.entryId, block: plots.block })
        .from(plots)
        .where(and(eq(plots.trialId, trialId), siteFilter(trial, plots.siteId)))
        .orderBy(asc(plots.siteId), asc(plots.block), asc(plots.position)),
      (r): InputPlot => ({ id: r[0] as number, plotCode: r[1] as string, siteId: r[2] as number, entryId: r[3] as number, block: r[4] as number }),
    ),
    wanted.length === 0
      ? Promise.resolve([])
      : arrayRows(
          db
            .select({
              plotId: observations.plotId,
              traitId: observations.traitId,
              occasion: observations.occasion,
              valueNumber: observations.valueNumber,
              valueDate: observations.valueDate,
              missingReason: observations.missingReason,
            })
            .from(observations)
            .innerJoin(plots, eq(plots.id, observations.plotId))
            .where(and(eq(plots.trialId, trialId), siteFilter(trial, plots.siteId), inArray(observations.traitId, wanted))),
          (r): InputObservation => ({
            plotId: r[0] as number,
            traitId: r[1] as number,
            occasion: r[2] as number,
            valueNumber: r[3] as number | null,
            valueDate: r[4] as string | null,
            missingReason: r[5] as string | null,
          }),
        ),
    db
      .select({
        id: analysisExclusions.id,
        siteId: analysisExclusions.siteId,
        plotId: analysisExclusions.plotId,
        traitId: analysisExclusions.traitId,
        category: analysisExclusions.category,
        privateNote: analysisExclusions.privateNote,
        createdAt: analysisExclusions.createdAt,
        createdBy: users.name,
      })
      .from(analysisExclusions)
      .leftJoin(users, eq(users.id, analysisExclusions.createdById))
      .where(eq(analysisExclusions.trialId, trialId))
      .orderBy(asc(analysisExclusions.id)),
  ]);
  // Cooperators see their own sites' exclusions only, by category: the staff's note stays with the staff.
  const key = p.includeKey;
  const plotIds = new Set(plotRows.map((r) => r.id));
  const visibleSites = new Set(siteRows.map((r) => r.id));
  const exclusions = trial.siteIds === null ? exclusionRows : exclusionRows.filter((x) => (x.siteId !== null && visibleSites.has(x.siteId)) || (x.plotId !== null && plotIds.has(x.plotId)));
  return {
    trial: { id: trial.id, code: trial.code, title: trial.title, crop: trial.crop, blocks: trial.blocks, status: trial.status },
    traits: traitRows,
    entries: entryRows.map((e) => ({
      id: e.id,
      blindCode: e.blindCode,
      entryNumber: e.entryNumber,
      varietyName: key ? e.varietyName : null,
      varietyId: key ? e.varietyId : null,
      isCheck: key ? e.isCheck : false,
      labelGermination: key ? e.labelGermination : null,
      seedLot: key && e.seedSource ? `${e.seedSource} ${e.lotCode}` : null,
    })),
    sites: siteRows.map((s) => ({ ...s, status: s.status ?? "draft" })),
    plots: plotRows,
    observations: obsRows,
    exclusions: exclusions.map((x) => ({
      id: x.id,
      siteId: x.siteId,
      plotId: x.plotId,
      traitId: x.traitId,
      category: x.category,
      note: trial.siteIds === null ? x.privateNote : null,
      createdBy: trial.siteIds === null ? x.createdBy : null,
      createdAt: x.createdAt.toISOString(),
    })),
  };
}

/**
 * A short fingerprint of everything an analysis of the trial reads (the given traits' observations, submission
 * statuses, sowing dates, entries and seed lots, exclusions). It changes whenever the data do, so it
 * serves as the cache key and ETag. Value sums are part of it because timestamps have whole-second
 * resolution and two edits can land in the same second (a reason counts by its enum index
 * weighted by the row id, so changing one reason for another changes the version too). The access is checked already (getAnalysisAccess).
 */
export async function readAnalysisVersion(access: AnalysisAccess, traitIds: number[]): Promise<string> {
  const { trial } = access;
  const trialId = trial.id;
  // Only the traits the analysis reads count, so a plot note typed elsewhere keeps the yield analysis cached.
  const enrolmentFilter = trial.siteIds === null ? sql`` : sql`AND e.site_id IN (${sql.join(trial.siteIds.map((id) => sql`${id}`), sql`, `)})`;
  const plotFilter = trial.siteIds === null ? sql`` : sql`AND p.site_id IN (${sql.join(trial.siteIds.map((id) => sql`${id}`), sql`, `)})`;
  const traitFilter = traitIds.length > 0 ? sql`AND o.trait_id IN (${sql.join(traitIds.map((id) => sql`${id}`), sql`, `)})` : sql``;
  const [row] = await db.execute<Record<string, unknown>[]>(sql`
    SELECT
      (SELECT CONCAT(COUNT(*), '/', COALESCE(MAX(o.updated_at), ''), '/', COALESCE(SUM(o.id), 0), '/', COALESCE(SUM(o.value_number), 0), '/', COALESCE(SUM(TO_DAYS(o.value_date)), 0), '/', COALESCE(SUM(o.id * (o.missing_reason + 0)), 0))
         FROM observations o JOIN plots p ON p.id = o.plot_id WHERE p.trial_id = ${trialId} ${plotFilter} ${traitFilter}) AS obs,
      (SELECT COALESCE(GROUP_CONCAT(CONCAT(e.id, ':', COALESCE(e.sown_on, ''), ':', COALESCE(e.transplanted_on, ''), ':', COALESCE(s.status, ''), ':', COALESCE(s.updated_at, ''), ':', e.results_shared) ORDER BY e.id), '')
         FROM enrolments e LEFT JOIN submissions s ON s.enrolment_id = e.id WHERE e.trial_id = ${trialId} ${enrolmentFilter}) AS sites,
      (SELECT CONCAT(COUNT(*), '/', COALESCE(SUM(x.id), 0), '/', COALESCE(MAX(x.created_at), ''))
         FROM analysis_exclusions x WHERE x.trial_id = ${trialId}) AS exclusions,
      (SELECT COALESCE(GROUP_CONCAT(CONCAT(te.id, ':', te.blind_code, ':', COALESCE(sl.label_germination_pct, '')) ORDER BY te.id), '')
         FROM trial_entries te LEFT JOIN seed_lots sl ON sl.id = te.seed_lot_id WHERE te.trial_id = ${trialId}) AS entries,
      (SELECT CONCAT(COUNT(*), '/', COALESCE(MAX(p.id), 0)) FROM plots p WHERE p.trial_id = ${trialId}) AS plots,
      (SELECT CONCAT(updated_at, ':', status) FROM trials WHERE id = ${trialId}) AS trial,
      (SELECT COALESCE(GROUP_CONCAT(CONCAT(tt.trait_id, ':', COALESCE(tt.better_when, t.better_when)) ORDER BY tt.trait_id), '')
         FROM trial_traits tt JOIN traits t ON t.id = tt.trait_id WHERE tt.trial_id = ${trialId}) AS directions
  `);
  const first = (row as unknown as Record<string, unknown>[])[0] ?? {};
  return Object.values(first).map((v) => (v instanceof Date ? v.toISOString() : String(v ?? ""))).join("|");
}

/**
 * Sites of a trial for the exclusion form, one plot code as an example, and every exclusion of the trial
 * with its private note (staff only). Plots are typed by code rather than listed: a large trial has thousands.
 */
export async function listExclusionTargets(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return null;
  const trial = await scopedTrial(viewer, trialId);
  if (!trial) return null;
  const plotSites = alias(sites, "plot_sites");
  const [siteRows, [example], exclusionRows] = await Promise.all([
    db.select({ id: sites.id, name: sites.name }).from(enrolments).innerJoin(sites, eq(sites.id, enrolments.siteId)).where(eq(enrolments.trialId, trialId)).orderBy(asc(sites.name)),
    db.select({ plotCode: plots.plotCode }).from(plots).where(eq(plots.trialId, trialId)).orderBy(asc(plots.plotCode)).limit(1),
    db
      .select({
        id: analysisExclusions.id,
        siteName: sql<string | null>`COALESCE(${sites.name}, ${plotSites.name})`,
        plotCode: plots.plotCode,
        traitName: traits.name,
        category: analysisExclusions.category,
        note: analysisExclusions.privateNote,
        createdAt: analysisExclusions.createdAt,
        createdBy: users.name,
      })
      .from(analysisExclusions)
      .leftJoin(sites, eq(sites.id, analysisExclusions.siteId))
      .leftJoin(plots, eq(plots.id, analysisExclusions.plotId))
      .leftJoin(plotSites, eq(plotSites.id, plots.siteId))
      .leftJoin(traits, eq(traits.id, analysisExclusions.traitId))
      .leftJoin(users, eq(users.id, analysisExclusions.createdById))
      .where(eq(analysisExclusions.trialId, trialId))
      .orderBy(asc(analysisExclusions.id)),
  ]);
  const exclusions = exclusionRows.map((x) => ({ ...x, createdAt: x.createdAt.toISOString() }));
  return { sites: siteRows, examplePlotCode: example?.plotCode ?? null, exclusions };
}

/**
 * One of the viewer's programs' varieties with its results across trials and seasons: the trials it was
 * entered in, with season and site count. Null when the variety is unknown or another program's.
 */
export async function getVarietyHistory(viewer: Viewer, varietyId: number) {
  if (!isStaff(viewer)) return null;
  const [variety] = await db
    .select({ id: varieties.id, name: varieties.name, crop: crops.name, cropId: crops.id })
    .from(varieties)
    .innerJoin(crops, eq(crops.id, varieties.cropId))
    .where(and(eq(varieties.id, varietyId), staffVarietyScope(viewer)));
  if (!variety) return null;
  const rows = await db
    .select({
      trialId: trials.id,
      trialCode: trials.code,
      trialTitle: trials.title,
      status: trials.status,
      season: seasons.name,
      year: seasons.year,
      entryId: trialEntries.id,
      blindCode: trialEntries.blindCode,
      isCheck: trialEntries.isCheck,
      entries: sql<number>`(SELECT COUNT(*) FROM trial_entries te2 WHERE te2.trial_id = ${trials.id})`.mapWith(Number),
      sites: sql<number>`(SELECT COUNT(*) FROM enrolments e2 WHERE e2.trial_id = ${trials.id})`.mapWith(Number),
    })
    .from(trialEntries)
    .innerJoin(trials, eq(trials.id, trialEntries.trialId))
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .where(and(eq(trialEntries.varietyId, varietyId), staffTrialScope(viewer)))
    .orderBy(desc(seasons.year), desc(seasons.id), asc(trials.code));
  return { variety, trials: rows };
}
