import "server-only";
import { and, asc, count, eq, inArray, or, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { crops, enrolments, observations, seedLots, trialEntries, trialTraits, traits, trials, varieties } from "../schema";
import { insertAudit } from "../audit";
import { cropUsedByOtherPrograms, isDuplicateKey, programScope, requireStaff, resolveProgram, staffTrialScope, staffVarietyScope } from "../access";
import { AppError } from "@/lib/errors";
import { plural } from "@/lib/domain/vocabulary/words";
import type { Viewer } from "@/lib/domain/viewer";
import type { CropGroup, TRAIT_COMPUTATIONS, TraitType } from "@/lib/domain/vocabulary/enums";

// The catalogue rows as the forms deliver them once validated (lib/validation/catalogue.ts); optional
// fields are stored as NULL when left out.
export interface CropInput {
  name: string;
  cropGroup: CropGroup;
  scientificName?: string;
}
export interface VarietyInput {
  /** The program a new variety joins; left out when the viewer runs only one. */
  programId?: number;
  cropId: number;
  name: string;
  description?: string;
}
export interface SeedLotInput {
  varietyId: number;
  source: string;
  lotCode: string;
  labelGerminationPct?: number;
  germinationTestDate?: string;
  packetDaysToMaturity?: number;
  treated: boolean;
  treatment?: string;
}
export interface TraitInput {
  /** The program a new trait joins; left out when the viewer runs only one. */
  programId?: number;
  code: string;
  name: string;
  unit?: string;
  valueType: TraitType;
  minValue?: number;
  maxValue?: number;
  /** Days after sowing the value is due, ascending. */
  dueDaysAfterSowing?: number[];
  dueNote?: string;
  computation: (typeof TRAIT_COMPUTATIONS)[number];
  description?: string;
}

// Form input to row values, shared by add and edit so the two can never store a field differently.
const cropValues = (i: CropInput) => ({ name: i.name, cropGroup: i.cropGroup, scientificName: i.scientificName ?? null });
const varietyValues = (i: VarietyInput) => ({ cropId: i.cropId, name: i.name, description: i.description ?? null });
const seedLotValues = (i: SeedLotInput) => ({
  varietyId: i.varietyId,
  source: i.source,
  lotCode: i.lotCode,
  labelGerminationPct: i.labelGerminationPct ?? null,
  germinationTestDate: i.germinationTestDate ?? null,
  packetDaysToMaturity: i.packetDaysToMaturity ?? null,
  treated: i.treated,
  treatment: i.treated ? (i.treatment ?? null) : null,
});
const traitValues = (i: TraitInput) => ({
  code: i.code,
  name: i.name,
  unit: i.unit ?? null,
  valueType: i.valueType,
  minValue: i.minValue ?? null,
  maxValue: i.maxValue ?? null,
  dueDaysAfterSowing: i.dueDaysAfterSowing ?? null,
  dueNote: i.dueNote ?? null,
  computation: i.computation,
  description: i.description ?? null,
});

interface Change {
  id: number;
  oldValue?: unknown;
  newValue?: unknown;
}

/**
 * Every catalogue write: staff only, one transaction with its audit entry, and a unique-key clash turned
 * into a plain field error. `write` does the checks and the write and says what changed.
 */
async function writeCatalogue(p: {
  viewer: Viewer;
  entity: string;
  action: "create" | "update" | "delete";
  duplicate?: { field: string; message: string };
  write: (tx: Tx) => Promise<Change>;
}): Promise<number> {
  requireStaff(p.viewer);
  try {
    return await db.transaction(async (tx) => {
      const change = await p.write(tx);
      await insertAudit(tx, { actorId: p.viewer.id, action: p.action, entity: p.entity, entityId: change.id, oldValue: change.oldValue ?? null, newValue: change.newValue ?? null });
      return change.id;
    });
  } catch (e) {
    if (p.duplicate && isDuplicateKey(e)) throw new AppError("conflict", p.duplicate.message, { [p.duplicate.field]: [p.duplicate.message] });
    throw e;
  }
}

const insertedId = (rows: { id: number }[]) => rows[0]!.id;

/** A trial that uses a catalogue item; `mine` says whether the viewer may know its code. */
interface UsingTrial {
  code: string;
  status: string;
  mine: boolean;
}

/**
 * "trial TV27-KAL", "trials TV26-LET and TV27-KAL", "trials A, B, C and 2 more". Refusals name only the
 * viewer's own trials; another program's trials are counted, never named.
 */
function trialsPhrase(usedBy: UsingTrial[]) {
  const named = usedBy.filter((t) => t.mine).map((t) => t.code);
  const shown = named.slice(0, 3);
  const more = usedBy.length - shown.length;
  if (shown.length === 0) return more === 1 ? "a trial of another program" : `${more} trials of other programs`;
  const list = more > 0 ? `${shown.join(", ")} and ${more} more` : shown.length > 1 ? `${shown.slice(0, -1).join(", ")} and ${shown.at(-1)}` : shown[0]!;
  return `${usedBy.length === 1 ? "trial" : "trials"} ${list}`;
}

/** Whether a trial row is one of the viewer's, as a selectable 0/1 column. */
const mineColumn = (viewer: Viewer) => sql<boolean>`(${staffTrialScope(viewer)})`.mapWith((v) => Number(v) === 1);

/** Trials that use a variety or a seed lot as an entry, with their statuses. */
async function trialsWithEntry(tx: Tx, viewer: Viewer, where: ReturnType<typeof eq>): Promise<UsingTrial[]> {
  return tx
    .selectDistinct({ code: trials.code, status: trials.status, mine: mineColumn(viewer) })
    .from(trialEntries)
    .innerJoin(trials, eq(trials.id, trialEntries.trialId))
    .where(where)
    .orderBy(asc(trials.code));
}

async function requireCrop(tx: Tx, cropId: number, field = "cropId") {
  const [crop] = await tx.select({ id: crops.id, name: crops.name }).from(crops).where(eq(crops.id, cropId));
  if (!crop) throw new AppError("bad_request", "That crop is not in the catalogue.", { [field]: ["Choose a crop from the list."] });
  return crop;
}

/** One of the viewer's programs' varieties; another program's variety is refused as if it did not exist. */
async function requireVariety(tx: Tx, viewer: Viewer, varietyId: number, field = "varietyId") {
  const [variety] = await tx.select({ id: varieties.id, programId: varieties.programId }).from(varieties).where(and(eq(varieties.id, varietyId), staffVarietyScope(viewer)));
  if (!variety) throw new AppError("bad_request", "That variety is not in your program's catalogue.", { [field]: ["Choose a variety from the list."] });
  return variety;
}

/** A custom trait's code may not repeat a built-in one: trials record both, and growers' sheets name columns by code. */
async function requireFreeTraitCode(tx: Tx, code: string) {
  const [builtIn] = await tx.select({ id: traits.id }).from(traits).where(and(eq(traits.code, code), eq(traits.builtIn, true)));
  if (builtIn) throw new AppError("conflict", TRAIT_DUPLICATE.message, { code: [TRAIT_DUPLICATE.message] });
}

const CROP_DUPLICATE = { field: "name", message: "A crop with this name is already in the catalogue." };
const VARIETY_DUPLICATE = { field: "name", message: "Your program already has a variety of this crop with this name." };
const LOT_DUPLICATE = { field: "lotCode", message: "This lot from this source is already recorded for the variety." };
const TRAIT_DUPLICATE = { field: "code", message: "A trait in your library already uses this code; choose another code." };

export async function insertCrop(viewer: Viewer, input: CropInput) {
  return writeCatalogue({
    viewer,
    entity: "crop",
    action: "create",
    duplicate: CROP_DUPLICATE,
    write: async (tx) => ({ id: insertedId(await tx.insert(crops).values(cropValues(input)).$returningId()), newValue: input }),
  });
}

export async function insertVariety(viewer: Viewer, input: VarietyInput) {
  return writeCatalogue({
    viewer,
    entity: "variety",
    action: "create",
    duplicate: VARIETY_DUPLICATE,
    write: async (tx) => {
      const programId = await resolveProgram(tx, viewer, input.programId);
      await requireCrop(tx, input.cropId);
      return { id: insertedId(await tx.insert(varieties).values({ ...varietyValues(input), programId }).$returningId()), newValue: { ...input, programId } };
    },
  });
}

export async function insertSeedLot(viewer: Viewer, input: SeedLotInput) {
  return writeCatalogue({
    viewer,
    entity: "seed_lot",
    action: "create",
    duplicate: LOT_DUPLICATE,
    write: async (tx) => {
      await requireVariety(tx, viewer, input.varietyId);
      return { id: insertedId(await tx.insert(seedLots).values(seedLotValues(input)).$returningId()), newValue: input };
    },
  });
}

/** Adds a trait to one of the viewer's programs; built-in traits come only from the seed script. */
export async function insertTrait(viewer: Viewer, input: TraitInput) {
  return writeCatalogue({
    viewer,
    entity: "trait",
    action: "create",
    duplicate: TRAIT_DUPLICATE,
    write: async (tx) => {
      const programId = await resolveProgram(tx, viewer, input.programId);
      await requireFreeTraitCode(tx, input.code);
      return { id: insertedId(await tx.insert(traits).values({ ...traitValues(input), builtIn: false, programId }).$returningId()), newValue: { ...input, programId } };
    },
  });
}

// Edits and deletes lock the row first, so a check ("not used by any trial") and the write it allows
// cannot be split by another coordinator's change. Varieties, seed lots and custom traits are found only
// within the viewer's programs: another program's row answers exactly like a deleted one.

async function lockCrop(tx: Tx, cropId: number) {
  const [row] = await tx.select().from(crops).where(eq(crops.id, cropId)).for("update");
  if (!row) throw new AppError("not_found", "That crop is no longer in the catalogue.");
  return row;
}

/** Crops are shared: one that another program grows is renamed or deleted only by an admin. */
async function assertCropNotShared(tx: Tx, viewer: Viewer, crop: { id: number; name: string }, change: "renamed" | "deleted") {
  if (await cropUsedByOtherPrograms(tx, viewer, crop.id)) {
    throw new AppError("conflict", `Another program also grows ${crop.name}, so only an administrator can change or delete it. Ask one if it must be ${change}.`);
  }
}

async function lockVariety(tx: Tx, viewer: Viewer, varietyId: number) {
  const [row] = await tx.select().from(varieties).where(and(eq(varieties.id, varietyId), staffVarietyScope(viewer))).for("update");
  if (!row) throw new AppError("not_found", "That variety is not in your program's catalogue.");
  return row;
}

async function lockSeedLot(tx: Tx, viewer: Viewer, seedLotId: number) {
  const [found] = await tx
    .select({ lot: seedLots })
    .from(seedLots)
    .innerJoin(varieties, eq(varieties.id, seedLots.varietyId))
    .where(and(eq(seedLots.id, seedLotId), staffVarietyScope(viewer)))
    .for("update");
  if (!found) throw new AppError("not_found", "That seed lot is not in your program's catalogue.");
  return found.lot;
}

/** A built-in trait (refused by the caller) or one of the viewer's programs' own traits. */
async function lockTrait(tx: Tx, viewer: Viewer, traitId: number) {
  const [row] = await tx
    .select()
    .from(traits)
    .where(and(eq(traits.id, traitId), or(eq(traits.builtIn, true), programScope(viewer, traits.programId))))
    .for("update");
  if (!row) throw new AppError("not_found", "That trait is not in your trait library.");
  return row;
}

/**
 * Renames or regroups a crop. Trials show the current name; published reports keep the name they were
 * published with. A crop another program grows changes only by an admin.
 */
export async function updateCrop(viewer: Viewer, input: CropInput & { cropId: number }) {
  return writeCatalogue({
    viewer,
    entity: "crop",
    action: "update",
    duplicate: CROP_DUPLICATE,
    write: async (tx) => {
      const old = await lockCrop(tx, input.cropId);
      await assertCropNotShared(tx, viewer, old, "renamed");
      await tx.update(crops).set(cropValues(input)).where(eq(crops.id, old.id));
      return { id: old.id, oldValue: old, newValue: input };
    },
  });
}

/** Deletes a crop that has no varieties and no trials (and that no other program grows, unless an admin asks). */
export async function deleteCrop(viewer: Viewer, input: { cropId: number }) {
  return writeCatalogue({
    viewer,
    entity: "crop",
    action: "delete",
    write: async (tx) => {
      const old = await lockCrop(tx, input.cropId);
      await assertCropNotShared(tx, viewer, old, "deleted");
      const usedBy = await tx.select({ code: trials.code, status: trials.status, mine: mineColumn(viewer) }).from(trials).where(eq(trials.cropId, old.id)).orderBy(asc(trials.code));
      if (usedBy.length > 0) throw new AppError("conflict", `${old.name} cannot be deleted because it is the crop of ${trialsPhrase(usedBy)}.`);
      const [kids] = await tx.select({ n: count() }).from(varieties).where(eq(varieties.cropId, old.id));
      if ((kids?.n ?? 0) > 0) throw new AppError("conflict", `${old.name} cannot be deleted because it still has ${plural(kids!.n, "variety", "varieties")}. Delete those first.`);
      await tx.delete(crops).where(eq(crops.id, old.id));
      return { id: old.id, oldValue: old };
    },
  });
}

/**
 * Edits a variety. Its name and notes may always be corrected; it may move to another crop only while
 * no trial has it as an entry, because an entry must be of its trial's crop.
 */
export async function updateVariety(viewer: Viewer, input: VarietyInput & { varietyId: number }) {
  return writeCatalogue({
    viewer,
    entity: "variety",
    action: "update",
    duplicate: VARIETY_DUPLICATE,
    write: async (tx) => {
      const old = await lockVariety(tx, viewer, input.varietyId);
      if (old.cropId !== input.cropId) {
        await requireCrop(tx, input.cropId);
        const usedBy = await trialsWithEntry(tx, viewer, eq(trialEntries.varietyId, old.id));
        if (usedBy.length > 0) {
          const message = `${old.name} is an entry in ${trialsPhrase(usedBy)}, so it must stay with its crop.`;
          throw new AppError("conflict", message, { cropId: [message] });
        }
      }
      // The program a variety belongs to never changes here.
      await tx.update(varieties).set(varietyValues(input)).where(eq(varieties.id, old.id));
      return { id: old.id, oldValue: old, newValue: input };
    },
  });
}

/** Deletes a variety that is in no trial and has no seed lots left. */
export async function deleteVariety(viewer: Viewer, input: { varietyId: number }) {
  return writeCatalogue({
    viewer,
    entity: "variety",
    action: "delete",
    write: async (tx) => {
      const old = await lockVariety(tx, viewer, input.varietyId);
      const usedBy = await trialsWithEntry(tx, viewer, eq(trialEntries.varietyId, old.id));
      if (usedBy.length > 0) throw new AppError("conflict", `${old.name} cannot be deleted because it is an entry in ${trialsPhrase(usedBy)}.`);
      const [lots] = await tx.select({ n: count() }).from(seedLots).where(eq(seedLots.varietyId, old.id));
      if ((lots?.n ?? 0) > 0) throw new AppError("conflict", `${old.name} cannot be deleted because it still has ${plural(lots!.n, "seed lot")}. Delete those first.`);
      await tx.delete(varieties).where(eq(varieties.id, old.id));
      return { id: old.id, oldValue: old };
    },
  });
}

// Once a trial is published its report records the lot's label germination and treatment; changing them
// underneath would make the trial disagree with what was published without anyone deciding so.
const RECORDED_STATUSES = ["published", "archived"] as const;
const LABEL_FIELDS = ["labelGerminationPct", "germinationTestDate", "treated", "treatment"] as const;

/**
 * Edits a seed lot. Source, lot code and days to maturity may always be corrected. A lot that an entry
 * uses cannot move to another variety, and its label facts are fixed while a trial using it is published.
 */
export async function updateSeedLot(viewer: Viewer, input: SeedLotInput & { seedLotId: number }) {
  return writeCatalogue({
    viewer,
    entity: "seed_lot",
    action: "update",
    duplicate: LOT_DUPLICATE,
    write: async (tx) => {
      const old = await lockSeedLot(tx, viewer, input.seedLotId);
      const next = seedLotValues(input);
      const usedBy = await trialsWithEntry(tx, viewer, eq(trialEntries.seedLotId, old.id));
      if (old.varietyId !== next.varietyId) {
        await requireVariety(tx, viewer, next.varietyId);
        if (usedBy.length > 0) {
          const message = `Lot ${old.lotCode} is used by an entry in ${trialsPhrase(usedBy)}, so it must stay with its variety.`;
          throw new AppError("conflict", message, { varietyId: [message] });
        }
      }
      const recorded = usedBy.filter((t) => (RECORDED_STATUSES as readonly string[]).includes(t.status));
      const changedLabel = LABEL_FIELDS.filter((f) => String(old[f] ?? "") !== String(next[f] ?? ""));
      if (recorded.length > 0 && changedLabel.length > 0) {
        const message = `This lot's label germination and treatment are part of the published results of ${trialsPhrase(recorded)}, so they cannot change. Withdraw the published results first if the label was entered wrong.`;
        throw new AppError("conflict", message, Object.fromEntries(changedLabel.map((f) => [f, [message]])));
      }
      await tx.update(seedLots).set(next).where(eq(seedLots.id, old.id));
      return { id: old.id, oldValue: old, newValue: input };
    },
  });
}

/** Deletes a seed lot that no trial entry uses. */
export async function deleteSeedLot(viewer: Viewer, input: { seedLotId: number }) {
  return writeCatalogue({
    viewer,
    entity: "seed_lot",
    action: "delete",
    write: async (tx) => {
      const old = await lockSeedLot(tx, viewer, input.seedLotId);
      const usedBy = await trialsWithEntry(tx, viewer, eq(trialEntries.seedLotId, old.id));
      if (usedBy.length > 0) throw new AppError("conflict", `Lot ${old.lotCode} cannot be deleted because an entry in ${trialsPhrase(usedBy)} uses it.`);
      await tx.delete(seedLots).where(eq(seedLots.id, old.id));
      return { id: old.id, oldValue: old };
    },
  });
}

const BUILT_IN = "Built-in traits come with Seedplot and cannot be changed or deleted. Add your own trait instead.";
// What a value means and when it is due: growers' sheets, templates and stored values depend on these.
const MEANING_FIELDS = ["code", "valueType", "minValue", "maxValue", "dueDaysAfterSowing", "computation"] as const;

/** Trials recording a trait, and whether any has a laid-out site or recorded values for it. */
async function traitUsage(tx: Tx, viewer: Viewer, traitId: number) {
  const usedBy = await tx
    .select({ code: trials.code, status: trials.status, mine: mineColumn(viewer) })
    .from(trialTraits)
    .innerJoin(trials, eq(trials.id, trialTraits.trialId))
    .where(eq(trialTraits.traitId, traitId))
    .orderBy(asc(trials.code));
  const [laidOut] = await tx
    .select({ n: count() })
    .from(enrolments)
    .where(and(inArray(enrolments.trialId, tx.select({ id: trialTraits.trialId }).from(trialTraits).where(eq(trialTraits.traitId, traitId))), sql`${enrolments.randomisedAt} IS NOT NULL`));
  const [values] = await tx.select({ n: count() }).from(observations).where(eq(observations.traitId, traitId));
  return { usedBy, laidOutSites: laidOut?.n ?? 0, values: values?.n ?? 0 };
}

/** A trait another program's trials record is changed or deleted only by an admin. */
function assertTraitNotShared(usedBy: UsingTrial[]) {
  if (usedBy.some((t) => !t.mine)) throw new AppError("conflict", "Another program's trials record this trait, so only an administrator can change or delete it.");
}

/**
 * Edits one of the viewer's programs' traits. Name, unit, timing note and description may always change.
 * Its code, kind, range, due days and computation are fixed once a trial using it has printed layouts or
 * recorded values.
 */
export async function updateTrait(viewer: Viewer, input: TraitInput & { traitId: number }) {
  return writeCatalogue({
    viewer,
    entity: "trait",
    action: "update",
    duplicate: TRAIT_DUPLICATE,
    write: async (tx) => {
      const old = await lockTrait(tx, viewer, input.traitId);
      if (old.builtIn) throw new AppError("conflict", BUILT_IN);
      const next = traitValues(input);
      if (next.code !== old.code) await requireFreeTraitCode(tx, next.code);
      const usage = await traitUsage(tx, viewer, old.id);
      assertTraitNotShared(usage.usedBy);
      const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
      const changedMeaning = MEANING_FIELDS.filter((f) => !same(old[f], next[f]));
      if (changedMeaning.length > 0) {
        if (usage.values > 0 || usage.laidOutSites > 0) {
          const why = usage.values > 0 ? "values are already recorded for this trait" : `sites in ${trialsPhrase(usage.usedBy)} are already laid out with it`;
          const message = `Only the name, unit, timing note and description can change now: ${why}.`;
          throw new AppError("conflict", message, Object.fromEntries(changedMeaning.map((f) => [f, [message]])));
        }
      }
      await tx.update(traits).set(next).where(eq(traits.id, old.id));
      return { id: old.id, oldValue: old, newValue: input };
    },
  });
}

/** Deletes one of the viewer's programs' traits that no trial records. */
export async function deleteTrait(viewer: Viewer, input: { traitId: number }) {
  return writeCatalogue({
    viewer,
    entity: "trait",
    action: "delete",
    write: async (tx) => {
      const old = await lockTrait(tx, viewer, input.traitId);
      if (old.builtIn) throw new AppError("conflict", BUILT_IN);
      const usage = await traitUsage(tx, viewer, old.id);
      assertTraitNotShared(usage.usedBy);
      if (usage.usedBy.length > 0) throw new AppError("conflict", `${old.name} cannot be deleted because it is recorded in ${trialsPhrase(usage.usedBy)}. Take it off first.`);
      if (usage.values > 0) throw new AppError("conflict", `${old.name} cannot be deleted because values are recorded for it.`);
      await tx.delete(traits).where(eq(traits.id, old.id));
      return { id: old.id, oldValue: old };
    },
  });
}
