import "server-only";
import { and, asc, count, eq, inArray, or, sql } from "drizzle-orm";
import type { Tx } from "../index";
import { enrolments, observations, plots, programCoordinators, seasons, seedLots, siteCooperators, sites, trialEntries, trialTraits, traits, trials, users, varieties, crops } from "../schema";
import type { BetterWhen, PlotUnit, TrialDesign, TrialStatus } from "@/lib/domain/vocabulary/enums";
import type { SitePlot } from "@/lib/domain/design/site-layout";
import { insertAudit } from "../audit";
import { renewPublicGeneration } from "./publish";
import { isDuplicateKey, requireStaff, type LockedTrial } from "../access";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";

// Persistence of trials, their entries and enrolled sites. The decisions (status rules, blind codes,
// layouts, who is invited) are made in server/trials before these functions are called inside its transaction.

/** The design fields a coordinator edits, as stored. */
export interface TrialDesignRow {
  title: string;
  purpose?: string;
  design: TrialDesign;
  blocks: number;
  plotUnit: PlotUnit;
  plotSize: number;
  seedsPerCell: number;
  protocol?: string;
  traitIds: number[];
}

/** A new trial: its season, crop and code, then its design. */
export interface NewTrialRow extends TrialDesignRow {
  seasonId: number;
  cropId: number;
  code: string;
}

/**
 * A trial records built-in traits and its own program's traits, nothing of another program's. Traits it
 * already records stay allowed, so a trial from before programs owned traits can still be edited.
 */
async function checkTraitsUsable(tx: Tx, programId: number, traitIds: number[], alreadyRecorded: number[] = []) {
  if (traitIds.length === 0) return;
  const found = await tx
    .select({ id: traits.id })
    .from(traits)
    .where(and(inArray(traits.id, traitIds), or(eq(traits.builtIn, true), eq(traits.programId, programId), inArray(traits.id, [0, ...alreadyRecorded]))));
  if (found.length !== new Set(traitIds).size) throw new AppError("bad_request", "One of the chosen traits is not in this program's trait library.", { traitIds: ["Choose traits from the list."] });
}

/**
 * Sets the trial's traits to `traitIds`. Traits it already records keep their place and direction; new
 * ones follow them in the order given; traits no longer chosen are dropped.
 */
async function replaceTraits(tx: Tx, trialId: number, traitIds: number[]) {
  const wanted = [...new Set(traitIds)];
  const existing = await tx.select({ traitId: trialTraits.traitId }).from(trialTraits).where(eq(trialTraits.trialId, trialId)).orderBy(asc(trialTraits.sortOrder), asc(trialTraits.id));
  const kept = existing.map((e) => e.traitId).filter((id) => wanted.includes(id));
  const dropped = existing.map((e) => e.traitId).filter((id) => !wanted.includes(id));
  if (dropped.length > 0) await tx.delete(trialTraits).where(and(eq(trialTraits.trialId, trialId), inArray(trialTraits.traitId, dropped)));
  const order = [...kept, ...wanted.filter((id) => !kept.includes(id))];
  for (const [i, traitId] of order.entries()) {
    if (kept.includes(traitId)) await tx.update(trialTraits).set({ sortOrder: i }).where(and(eq(trialTraits.trialId, trialId), eq(trialTraits.traitId, traitId)));
    else await tx.insert(trialTraits).values({ trialId, traitId, sortOrder: i });
  }
}

/** What ordering traits needs to know about the chosen ones (see defaultTraitOrder). */
export async function listOrderableTraits(tx: Tx, traitIds: number[]) {
  if (traitIds.length === 0) return [];
  return tx
    .select({ id: traits.id, code: traits.code, valueType: traits.valueType, dueDaysAfterSowing: traits.dueDaysAfterSowing, dueByDay: traits.dueByDay })
    .from(traits)
    .where(inArray(traits.id, traitIds));
}

/** Moves one of a trial's traits a place up or down in the order the form, sheets and reports follow. Audited. */
export async function moveTrialTraitRow(tx: Tx, p: { viewer: Viewer; trialId: number; traitId: number; direction: "up" | "down" }): Promise<boolean> {
  const rows = await tx.select({ id: trialTraits.id, traitId: trialTraits.traitId }).from(trialTraits).where(eq(trialTraits.trialId, p.trialId)).orderBy(asc(trialTraits.sortOrder), asc(trialTraits.id)).for("update");
  const i = rows.findIndex((r) => r.traitId === p.traitId);
  if (i < 0) return false;
  const j = p.direction === "up" ? i - 1 : i + 1;
  if (j < 0 || j >= rows.length) return true;
  [rows[i], rows[j]] = [rows[j]!, rows[i]!];
  for (const [k, r] of rows.entries()) await tx.update(trialTraits).set({ sortOrder: k }).where(eq(trialTraits.id, r.id));
  await insertAudit(tx, { actorId: p.viewer.id, action: "move_trait", entity: "trial_trait", entityId: p.traitId, trialId: p.trialId, newValue: { direction: p.direction, order: rows.map((r) => r.traitId) } });
  return true;
}

/** Inserts a draft trial in a season of one of the viewer's programs, with its traits and an audit entry. */
export async function insertTrial(tx: Tx, p: { viewer: Viewer; trial: NewTrialRow; programId?: number }): Promise<number> {
  const { viewer, trial: input } = p;
  requireStaff(viewer);
  // Locked, so a season being closed at this moment either takes this trial first or refuses it.
  const [season] = await tx
    .select({ id: seasons.id, programId: seasons.programId, name: seasons.name, closedAt: seasons.closedAt })
    .from(seasons)
    .where(
      viewer.role === "admin"
        ? eq(seasons.id, input.seasonId)
        : and(eq(seasons.id, input.seasonId), inArray(seasons.programId, tx.select({ id: programCoordinators.programId }).from(programCoordinators).where(eq(programCoordinators.userId, viewer.id)))),
    )
    .for("update");
  if (!season) throw new AppError("bad_request", "Choose a season of a program you coordinate.", { seasonId: ["Choose a season from the list."] });
  if (season.closedAt !== null) {
    const message = `${season.name} is closed, so it takes no new trials. Choose an open season, or open a new one on the Seasons page.`;
    throw new AppError("conflict", message, { seasonId: [message] });
  }
  if (p.programId !== undefined && season.programId !== p.programId) {
    throw new AppError("bad_request", "Choose a season of this trial's own program: its varieties and sites belong to that program.", { seasonId: ["Choose a season of this trial's program."] });
  }
  const [crop] = await tx.select({ id: crops.id }).from(crops).where(eq(crops.id, input.cropId));
  if (!crop) throw new AppError("bad_request", "That crop is not in the catalogue.", { cropId: ["Choose a crop from the list."] });
  await checkTraitsUsable(tx, season.programId, input.traitIds);
  let trialId: number;
  try {
    const [row] = await tx
      .insert(trials)
      .values({
        programId: season.programId,
        seasonId: season.id,
        cropId: input.cropId,
        code: input.code,
        title: input.title,
        purpose: input.purpose ?? null,
        design: input.design,
        blocks: input.blocks,
        plotUnit: input.plotUnit,
        plotSize: input.plotSize,
        seedsPerCell: input.seedsPerCell,
        protocol: input.protocol ?? null,
        status: "draft",
        createdById: viewer.id,
      })
      .$returningId();
    trialId = row!.id;
  } catch (e) {
    if (isDuplicateKey(e)) throw new AppError("conflict", "Another trial already uses this code.", { code: ["Another trial already uses this code."] });
    throw e;
  }
  await replaceTraits(tx, trialId, input.traitIds);
  await insertAudit(tx, { actorId: viewer.id, action: "create", entity: "trial", entityId: trialId, trialId, newValue: input });
  return trialId;
}

/** The traits a trial records, in their sheet order. */
export async function listTrialTraitIds(tx: Tx, trialId: number): Promise<number[]> {
  return (await tx.select({ id: trialTraits.traitId }).from(trialTraits).where(eq(trialTraits.trialId, trialId)).orderBy(asc(trialTraits.sortOrder))).map((t) => t.id);
}

/**
 * Stores a locked trial's edited design; its trait list is replaced only when `traitsChanged`. The traits
 * must be usable by the trial's program (or already recorded by it).
 */
export async function updateTrialDesign(tx: Tx, p: { viewer: Viewer; trial: LockedTrial; design: TrialDesignRow; currentTraitIds: number[]; traitsChanged: boolean }) {
  const { trial, design } = p;
  await checkTraitsUsable(tx, trial.programId, design.traitIds, p.currentTraitIds);
  await tx
    .update(trials)
    .set({ title: design.title, purpose: design.purpose ?? null, design: design.design, blocks: design.blocks, plotUnit: design.plotUnit, plotSize: design.plotSize, seedsPerCell: design.seedsPerCell, protocol: design.protocol ?? null })
    .where(eq(trials.id, trial.id));
  if (p.traitsChanged) await replaceTraits(tx, trial.id, design.traitIds);
  // a withdrawn trial's public notice shows its current title
  if (design.title !== trial.title) await renewPublicGeneration(tx);
  await insertAudit(tx, { actorId: p.viewer.id, action: "update", entity: "trial", entityId: trial.id, trialId: trial.id, oldValue: { ...trial, traitIds: p.currentTraitIds }, newValue: { trialId: trial.id, ...design } });
}

/**
 * One of the trial's program's varieties of the trial's crop (another program's variety is refused as if
 * it did not exist), and the seed lot when one is given, which must be of that variety.
 */
export async function getEntryVariety(tx: Tx, p: { trial: LockedTrial; varietyId: number; seedLotId?: number }) {
  const [variety] = await tx
    .select({ id: varieties.id, cropId: varieties.cropId, name: varieties.name })
    .from(varieties)
    .where(and(eq(varieties.id, p.varietyId), eq(varieties.programId, p.trial.programId)));
  if (!variety || variety.cropId !== p.trial.cropId) throw new AppError("bad_request", "Choose a variety of this trial's crop.", { varietyId: ["Choose a variety of this trial's crop."] });
  if (p.seedLotId !== undefined) {
    const [lot] = await tx.select({ varietyId: seedLots.varietyId }).from(seedLots).where(eq(seedLots.id, p.seedLotId));
    if (!lot || lot.varietyId !== variety.id) throw new AppError("bad_request", "That seed lot belongs to another variety.", { seedLotId: ["Choose a seed lot of this variety."] });
  }
  return { id: variety.id, name: variety.name };
}

/** A trial's entries with their codes, in entry order. */
export async function listTrialEntries(tx: Tx, trialId: number) {
  return tx
    .select({ id: trialEntries.id, varietyId: trialEntries.varietyId, blindCode: trialEntries.blindCode, entryNumber: trialEntries.entryNumber })
    .from(trialEntries)
    .where(eq(trialEntries.trialId, trialId))
    .orderBy(asc(trialEntries.entryNumber));
}

/** Inserts an entry whose blind code and number the caller drew, with an audit entry. */
export async function insertTrialEntry(
  tx: Tx,
  p: { viewer: Viewer; trialId: number; entry: { varietyId: number; seedLotId?: number; isCheck: boolean; blindCode: string; entryNumber: number } },
): Promise<number> {
  const { entry } = p;
  const [row] = await tx
    .insert(trialEntries)
    .values({ trialId: p.trialId, varietyId: entry.varietyId, seedLotId: entry.seedLotId ?? null, blindCode: entry.blindCode, entryNumber: entry.entryNumber, isCheck: entry.isCheck })
    .$returningId();
  await insertAudit(tx, { actorId: p.viewer.id, action: "add_entry", entity: "trial_entry", entityId: row!.id, trialId: p.trialId, newValue: { trialId: p.trialId, ...entry } });
  return row!.id;
}

/** Deletes one entry of the trial, with an audit entry; an entry of another trial is not found. */
export async function deleteTrialEntry(tx: Tx, p: { viewer: Viewer; trialId: number; entryId: number }) {
  const [entry] = await tx
    .select({ id: trialEntries.id, varietyId: trialEntries.varietyId, blindCode: trialEntries.blindCode })
    .from(trialEntries)
    .where(and(eq(trialEntries.id, p.entryId), eq(trialEntries.trialId, p.trialId)));
  if (!entry) throw new AppError("not_found", "That entry is not in this trial.");
  await tx.delete(trialEntries).where(eq(trialEntries.id, entry.id));
  await insertAudit(tx, { actorId: p.viewer.id, action: "remove_entry", entity: "trial_entry", entityId: entry.id, trialId: p.trialId, oldValue: entry });
}

/** How many entries, traits and sites a trial has, for the status rules. */
export async function countTrialParts(tx: Tx, trialId: number) {
  const [e] = await tx.select({ n: count() }).from(trialEntries).where(eq(trialEntries.trialId, trialId));
  const [t] = await tx.select({ n: count() }).from(trialTraits).where(eq(trialTraits.trialId, trialId));
  const [s] = await tx.select({ n: count() }).from(enrolments).where(eq(enrolments.trialId, trialId));
  return { entries: e?.n ?? 0, traits: t?.n ?? 0, sites: s?.n ?? 0 };
}

/** Stores a trial's new status, with the old one in the audit log. */
export async function updateTrialStatus(tx: Tx, p: { viewer: Viewer; trial: LockedTrial; status: TrialStatus }) {
  await tx.update(trials).set({ status: p.status }).where(eq(trials.id, p.trial.id));
  await insertAudit(tx, { actorId: p.viewer.id, action: "change_status", entity: "trial", entityId: p.trial.id, trialId: p.trial.id, oldValue: { status: p.trial.status }, newValue: { status: p.status } });
}

/** One of the trial's program's sites; another program's site is refused as if it did not exist. */
export async function getProgramSite(tx: Tx, p: { programId: number; siteId: number }) {
  const [site] = await tx
    .select({ id: sites.id, name: sites.name, contactName: sites.contactName, contactEmail: sites.contactEmail })
    .from(sites)
    .where(and(eq(sites.id, p.siteId), eq(sites.programId, p.programId)));
  if (!site) throw new AppError("bad_request", "Choose one of this program's sites.", { siteId: ["Choose a site from the list."] });
  return site;
}

/** The growers attached to a site, first attached first; `hasAccount` is false until an invitation is accepted. */
export async function listSiteGrowers(tx: Tx, siteId: number) {
  const rows = await tx
    .select({ id: users.id, name: users.name, email: users.email, locale: users.locale, passwordHash: users.passwordHash, active: users.active })
    .from(siteCooperators)
    .innerJoin(users, eq(users.id, siteCooperators.userId))
    .where(eq(siteCooperators.siteId, siteId))
    .orderBy(asc(siteCooperators.id));
  return rows.map(({ passwordHash, ...g }) => ({ ...g, hasAccount: passwordHash !== null }));
}

/** Enrols a site in a trial with its named grower and sowing date, with an audit entry of who was invited. */
export async function insertEnrolment(tx: Tx, p: { viewer: Viewer; trialId: number; siteId: number; cooperatorId: number | null; sownOn?: string; invited: string[]; namedInResults?: boolean }) {
  try {
    const [row] = await tx
      .insert(enrolments)
      .values({ trialId: p.trialId, siteId: p.siteId, cooperatorId: p.cooperatorId, sownOn: p.sownOn ?? null, namedInResults: p.namedInResults ?? false })
      .$returningId();
    await insertAudit(tx, { actorId: p.viewer.id, action: "enrol_site", entity: "enrolment", entityId: row!.id, trialId: p.trialId, newValue: { siteId: p.siteId, sownOn: p.sownOn ?? null, invited: p.invited } });
    return row!.id;
  } catch (e) {
    if (isDuplicateKey(e)) throw new AppError("conflict", "This site is already enrolled in the trial.", { siteId: ["This site is already enrolled."] });
    throw e;
  }
}

/** A site's enrolment in the trial, locked for the rest of the transaction. */
export async function lockEnrolment(tx: Tx, p: { trialId: number; siteId: number }) {
  const [enrolment] = await tx
    .select({ id: enrolments.id, randomSeed: enrolments.randomSeed, randomisedAt: enrolments.randomisedAt, sownOn: enrolments.sownOn })
    .from(enrolments)
    .where(and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId)))
    .for("update");
  if (!enrolment) throw new AppError("not_found", "This site is not enrolled in the trial.");
  return enrolment;
}

/** Values recorded at one enrolled site, with the earliest observation date and the earliest recorded date. */
export async function countSiteObservations(tx: Tx, enrolmentId: number) {
  const [recorded] = await tx
    .select({
      values: count(),
      firstObserved: sql<string | null>`MIN(${observations.observedOn})`,
      firstDate: sql<string | null>`MIN(${observations.valueDate})`,
    })
    .from(observations)
    .innerJoin(plots, eq(plots.id, observations.plotId))
    .where(eq(plots.enrolmentId, enrolmentId));
  return { values: recorded?.values ?? 0, firstObserved: recorded?.firstObserved ?? null, firstDate: recorded?.firstDate ?? null };
}

/** The trial's enrolments in enrolment order; a site's number in plot codes is its place in this list. */
export async function listEnrolmentIds(tx: Tx, trialId: number): Promise<number[]> {
  return (await tx.select({ id: enrolments.id }).from(enrolments).where(eq(enrolments.trialId, trialId)).orderBy(asc(enrolments.id))).map((e) => e.id);
}

/**
 * Replaces a site's plots with a drawn layout and stores its seed, with the old and new seeds in the audit
 * log. `entryIds[p.entryIndex]` is the entry of each plot.
 */
export async function replaceSitePlots(
  tx: Tx,
  p: { viewer: Viewer; trialId: number; siteId: number; enrolment: { id: number; randomSeed: number | null; randomisedAt: Date | null }; entryIds: number[]; layout: SitePlot[]; seed: number },
) {
  const { enrolment, layout } = p;
  await tx.delete(plots).where(eq(plots.enrolmentId, enrolment.id));
  await tx.insert(plots).values(
    layout.map((plot) => ({
      enrolmentId: enrolment.id,
      trialId: p.trialId,
      siteId: p.siteId,
      entryId: p.entryIds[plot.entryIndex]!,
      plotCode: plot.plotCode,
      block: plot.block,
      position: plot.position,
      tray: plot.tray,
      traySlot: plot.traySlot,
    })),
  );
  await tx.update(enrolments).set({ randomSeed: p.seed, randomisedAt: new Date() }).where(eq(enrolments.id, enrolment.id));
  await insertAudit(tx, {
    actorId: p.viewer.id,
    action: enrolment.randomisedAt ? "rerandomise" : "randomise",
    entity: "enrolment",
    entityId: enrolment.id,
    trialId: p.trialId,
    oldValue: enrolment.randomisedAt ? { seed: enrolment.randomSeed } : null,
    newValue: { seed: p.seed, plots: layout.length },
  });
}

/** Stores a site's new sowing date, with the old one and the number of values already recorded in the audit log. */
export async function updateSowingDate(tx: Tx, p: { viewer: Viewer; trialId: number; enrolment: { id: number; sownOn: string | null }; sownOn: string; valuesAtSite: number }) {
  await tx.update(enrolments).set({ sownOn: p.sownOn }).where(eq(enrolments.id, p.enrolment.id));
  await insertAudit(tx, {
    actorId: p.viewer.id,
    action: "change_sowing_date",
    entity: "enrolment",
    entityId: p.enrolment.id,
    trialId: p.trialId,
    oldValue: { sownOn: p.enrolment.sownOn },
    newValue: { sownOn: p.sownOn, valuesAtSite: p.valuesAtSite },
  });
}

/**
 * Sets (or, with null, clears back to the library's default) the trial's direction for one of its traits,
 * with an audit entry. Returns false when the trial does not record the trait.
 */
export async function updateTrialTraitDirection(tx: Tx, p: { viewer: Viewer; trialId: number; traitId: number; betterWhen: BetterWhen | null }): Promise<{ previous: BetterWhen | null } | null> {
  const [row] = await tx
    .select({ id: trialTraits.id, betterWhen: trialTraits.betterWhen })
    .from(trialTraits)
    .where(and(eq(trialTraits.trialId, p.trialId), eq(trialTraits.traitId, p.traitId)))
    .for("update");
  if (!row) return null;
  await tx.update(trialTraits).set({ betterWhen: p.betterWhen }).where(eq(trialTraits.id, row.id));
  await insertAudit(tx, { actorId: p.viewer.id, action: "set_direction", entity: "trial_trait", entityId: row.id, trialId: p.trialId, oldValue: { betterWhen: row.betterWhen }, newValue: { traitId: p.traitId, betterWhen: p.betterWhen } });
  return { previous: row.betterWhen };
}

/** What rolling a trial forward copies: its set-up, traits (order and directions), entries and sites. */
export async function getTrialForRollForward(tx: Tx, trialId: number) {
  const [trial] = await tx
    .select({
      programId: trials.programId,
      cropId: trials.cropId,
      title: trials.title,
      purpose: trials.purpose,
      design: trials.design,
      blocks: trials.blocks,
      plotUnit: trials.plotUnit,
      plotSize: trials.plotSize,
      seedsPerCell: trials.seedsPerCell,
      protocol: trials.protocol,
    })
    .from(trials)
    .where(eq(trials.id, trialId));
  const traitRows = await tx
    .select({ traitId: trialTraits.traitId, sortOrder: trialTraits.sortOrder, betterWhen: trialTraits.betterWhen })
    .from(trialTraits)
    .where(eq(trialTraits.trialId, trialId))
    .orderBy(asc(trialTraits.sortOrder), asc(trialTraits.id));
  const entryRows = await tx
    .select({ varietyId: trialEntries.varietyId, isCheck: trialEntries.isCheck, entryNumber: trialEntries.entryNumber })
    .from(trialEntries)
    .where(eq(trialEntries.trialId, trialId))
    .orderBy(asc(trialEntries.entryNumber));
  const siteRows = await tx.select({ siteId: enrolments.siteId }).from(enrolments).where(eq(enrolments.trialId, trialId)).orderBy(asc(enrolments.id));
  return { trial: trial!, traits: traitRows, entries: entryRows, siteIds: siteRows.map((r) => r.siteId) };
}

/** Carries the source trial's trait directions over to the new trial's traits, and links the two trials. */
export async function linkRolledForwardTrial(tx: Tx, p: { viewer: Viewer; trialId: number; previousTrialId: number; directions: { traitId: number; betterWhen: BetterWhen | null }[] }) {
  for (const d of p.directions) {
    if (d.betterWhen !== null) await tx.update(trialTraits).set({ betterWhen: d.betterWhen }).where(and(eq(trialTraits.trialId, p.trialId), eq(trialTraits.traitId, d.traitId)));
  }
  await tx.update(trials).set({ previousTrialId: p.previousTrialId }).where(eq(trials.id, p.trialId));
  await insertAudit(tx, { actorId: p.viewer.id, action: "roll_forward", entity: "trial", entityId: p.trialId, trialId: p.trialId, newValue: { previousTrialId: p.previousTrialId } });
}

/** Records whether a site's grower agreed to be named in public results; audited. False when it is not enrolled. */
export async function updateSiteNaming(tx: Tx, p: { viewer: Viewer; trialId: number; siteId: number; named: boolean }): Promise<boolean> {
  const [row] = await tx.select({ id: enrolments.id, named: enrolments.namedInResults }).from(enrolments).where(and(eq(enrolments.trialId, p.trialId), eq(enrolments.siteId, p.siteId))).for("update");
  if (!row) return false;
  await tx.update(enrolments).set({ namedInResults: p.named }).where(eq(enrolments.id, row.id));
  await insertAudit(tx, { actorId: p.viewer.id, action: "site_naming", entity: "enrolment", entityId: row.id, trialId: p.trialId, oldValue: { named: row.named }, newValue: { named: p.named } });
  return true;
}

/** Sets the seed lot of one of the trial's entries (checked by the caller against the entry's variety); audited. */
export async function updateEntrySeedLot(tx: Tx, p: { viewer: Viewer; trialId: number; entryId: number; seedLotId: number }) {
  await tx.update(trialEntries).set({ seedLotId: p.seedLotId }).where(and(eq(trialEntries.id, p.entryId), eq(trialEntries.trialId, p.trialId)));
  await insertAudit(tx, { actorId: p.viewer.id, action: "entry_seed_lot", entity: "trial_entry", entityId: p.entryId, trialId: p.trialId, newValue: { seedLotId: p.seedLotId } });
}
