import "server-only";
import { db, type Tx } from "@/db/index";
import { lockTrialForStaff, trialProgress, type LockedTrial } from "@/db/access";
import {
  countTrialParts,
  deleteTrialEntry,
  getEntryVariety,
  insertTrial,
  insertTrialEntry,
  listTrialEntries,
  listTrialTraitIds,
  updateTrialDesign,
  updateTrialStatus,
  updateTrialTraitDirection,
  updateEntrySeedLot,
  getTrialForRollForward,
  listOrderableTraits,
  moveTrialTraitRow,
  linkRolledForwardTrial,
  type NewTrialRow,
  type TrialDesignRow,
} from "@/db/mutations/trials";
import { blindCodes } from "@/lib/domain/design/blind-codes";
import { newSeed } from "@/lib/domain/design/random";
import { canEditDesign, canEditTraits, designLockReason, statusChangeProblem } from "@/lib/domain/design/status";
import type { BetterWhen, TrialStatus } from "@/lib/domain/vocabulary/enums";
import type { Viewer } from "@/lib/domain/viewer";
import { AppError } from "@/lib/errors";
import { defaultTraitOrder } from "@/lib/domain/vocabulary/traits";
import { enrolSiteInTx } from "./enrolment";

// A trial's set-up: creating it, editing its design and entries, and moving it along its life cycle. The
// status rules (lib/domain/design/status) are applied here, on the trial locked for the transaction.

/** Creates a draft trial in a season of one of the viewer's programs, with its traits, in one transaction. */
export async function createTrial(viewer: Viewer, trial: NewTrialRow): Promise<number> {
  return db.transaction(async (tx) => {
    // The form lists traits alphabetically; the trial records them in the order a grower meets them.
    const ordered = defaultTraitOrder(await listOrderableTraits(tx, trial.traitIds)).map((t) => t.id);
    const unknown = trial.traitIds.filter((id) => !ordered.includes(id));
    return insertTrial(tx, { viewer, trial: { ...trial, traitIds: [...ordered, ...unknown] } });
  });
}

/** Moves one of the trial's traits up or down; the form, sheets, spreadsheet, analysis and report follow. */
export async function moveTrialTrait(viewer: Viewer, input: { trialId: number; traitId: number; direction: "up" | "down" }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    if (trial.status === "archived") throw new AppError("conflict", "This trial is archived, so its settings can no longer change.");
    if (!(await moveTrialTraitRow(tx, { viewer, ...input }))) throw new AppError("not_found", "That trait is not recorded in this trial.");
  });
}

async function trialState(tx: Tx, trial: LockedTrial) {
  return { status: trial.status, ...(await trialProgress(tx, trial.id)) };
}

async function requireDesignEditable(tx: Tx, trial: LockedTrial) {
  const reason = designLockReason(await trialState(tx, trial));
  if (reason) throw new AppError("conflict", reason);
}

/** Edits the design. Blocks, plot unit and design freeze once a site is laid out; traits once data exist. */
export async function editTrialDesign(viewer: Viewer, input: TrialDesignRow & { trialId: number }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const state = await trialState(tx, trial);
    const designChanged = trial.design !== input.design || trial.blocks !== input.blocks || trial.plotUnit !== input.plotUnit || trial.plotSize !== input.plotSize;
    if (designChanged && !canEditDesign(state)) throw new AppError("conflict", designLockReason(state) ?? "The design can no longer change.");
    const currentTraitIds = await listTrialTraitIds(tx, trial.id);
    // The form lists traits in library order, so only a different set counts as a change.
    const sortedIds = (ids: number[]) => [...new Set(ids)].sort((a, b) => a - b).join(",");
    const traitsChanged = sortedIds(currentTraitIds) !== sortedIds(input.traitIds);
    if (traitsChanged && !canEditTraits(state)) throw new AppError("conflict", "The traits can no longer change because data collection has started.");
    const { trialId: _trialId, ...design } = input;
    await updateTrialDesign(tx, { viewer, trial, design, currentTraitIds, traitsChanged });
  });
}

/**
 * Adds one of the program's varieties (and a seed lot of it) as an entry, with a fresh blind code no other
 * entry of the trial has. Another program's variety is refused as if it did not exist.
 */
export async function addTrialEntry(viewer: Viewer, input: { trialId: number; varietyId: number; seedLotId?: number; isCheck: boolean }) {
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    await requireDesignEditable(tx, trial);
    const variety = await getEntryVariety(tx, { trial, varietyId: input.varietyId, seedLotId: input.seedLotId });
    const existing = await listTrialEntries(tx, trial.id);
    if (existing.some((e) => e.varietyId === variety.id)) {
      throw new AppError("conflict", `${variety.name} is already an entry in this trial.`, { varietyId: ["This variety is already an entry."] });
    }
    const [blindCode] = blindCodes(1, newSeed(), existing.map((e) => e.blindCode));
    const entryNumber = existing.reduce((m, e) => Math.max(m, e.entryNumber), 0) + 1;
    const entryId = await insertTrialEntry(tx, { viewer, trialId: trial.id, entry: { varietyId: variety.id, seedLotId: input.seedLotId, isCheck: input.isCheck, blindCode: blindCode!, entryNumber } });
    return { entryId, blindCode: blindCode! };
  });
}

/** Removes an entry while the design is still editable. */
export async function removeTrialEntry(viewer: Viewer, input: { trialId: number; entryId: number }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    await requireDesignEditable(tx, trial);
    await deleteTrialEntry(tx, { viewer, trialId: trial.id, entryId: input.entryId });
  });
}

/** Moves a trial one step along its life cycle when the status rules allow it. */
export async function moveTrialStatus(viewer: Viewer, input: { trialId: number; status: TrialStatus }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const state = { ...(await trialState(tx, trial)), ...(await countTrialParts(tx, trial.id)) };
    const problem = statusChangeProblem(state, input.status);
    if (problem) throw new AppError("conflict", problem);
    await updateTrialStatus(tx, { viewer, trial, status: input.status });
  });
}

/**
 * Sets which way is better for one trait of the trial (null: the trait library's default). Rankings,
 * "best" claims and the next published version follow it; versions already published keep theirs.
 * An archived trial is closed.
 */
export async function setTraitDirection(viewer: Viewer, input: { trialId: number; traitId: number; betterWhen: BetterWhen | null }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    if (trial.status === "archived") throw new AppError("conflict", "This trial is archived, so its settings can no longer change.");
    const done = await updateTrialTraitDirection(tx, { viewer, ...input });
    if (!done) throw new AppError("not_found", "That trait is not recorded in this trial.");
  });
}

/**
 * Plans the next season from a trial: a new draft in one of the same program's seasons with the same crop,
 * set-up, protocol, traits (order and directions), entries (varieties and the check, with fresh blind codes
 * and no seed lots: the coordinator picks this season's lots) and sites (enrolled again, their growers told
 * as for any enrolment). Nothing is laid out or sown. The new trial links back to the old one.
 */
export async function rollTrialForward(viewer: Viewer, input: { trialId: number; seasonId: number; code: string; title: string }) {
  return db.transaction(async (tx) => {
    const source = await lockTrialForStaff(tx, viewer, input.trialId);
    const from = await getTrialForRollForward(tx, source.id);
    const trialId = await insertTrial(tx, {
      viewer,
      trial: {
        seasonId: input.seasonId,
        cropId: from.trial.cropId,
        code: input.code,
        title: input.title,
        purpose: from.trial.purpose ?? undefined,
        design: from.trial.design,
        blocks: from.trial.blocks,
        plotUnit: from.trial.plotUnit,
        plotSize: from.trial.plotSize,
        seedsPerCell: from.trial.seedsPerCell,
        protocol: from.trial.protocol ?? undefined,
        traitIds: from.traits.map((t) => t.traitId),
      },
      programId: source.programId,
    });
    const codes = blindCodes(from.entries.length, newSeed(), []);
    for (const [i, e] of from.entries.entries()) {
      await insertTrialEntry(tx, { viewer, trialId, entry: { varietyId: e.varietyId, isCheck: e.isCheck, blindCode: codes[i]!, entryNumber: i + 1 } });
    }
    const trial = await lockTrialForStaff(tx, viewer, trialId);
    const invited: string[] = [];
    for (const siteId of from.siteIds) invited.push(...(await enrolSiteInTx(tx, viewer, trial, { siteId })).invited);
    await linkRolledForwardTrial(tx, { viewer, trialId, previousTrialId: source.id, directions: from.traits });
    return { trialId, entries: from.entries.length, sites: from.siteIds.length, invited };
  });
}

/** Picks the seed lot of an entry (this season's lot of the same variety) while the design can still change. */
export async function setEntrySeedLot(viewer: Viewer, input: { trialId: number; entryId: number; seedLotId: number }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    await requireDesignEditable(tx, trial);
    const entry = (await listTrialEntries(tx, trial.id)).find((e) => e.id === input.entryId);
    if (!entry) throw new AppError("not_found", "That entry is not part of this trial.");
    await getEntryVariety(tx, { trial, varietyId: entry.varietyId, seedLotId: input.seedLotId });
    await updateEntrySeedLot(tx, { viewer, trialId: trial.id, entryId: entry.id, seedLotId: input.seedLotId });
  });
}
