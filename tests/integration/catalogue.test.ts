import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { testDatabase, unique } from "../helpers/db";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import {
  deleteCrop,
  deleteSeedLot,
  deleteTrait,
  deleteVariety,
  insertCrop,
  insertSeedLot,
  insertTrait,
  insertVariety,
  updateCrop,
  updateSeedLot,
  updateTrait,
  updateVariety,
} from "@/db/mutations/catalogue";
import { createTrial, addTrialEntry } from "@/server/trials/design";
import { enrolTrialSite, randomiseTrialSite } from "@/server/trials/enrolment";
import { insertSite } from "@/db/mutations/sites";
import { listCrops, listSeedLots, listTraits, listVarieties } from "@/db/queries/catalogue";
import { createTrialSchema } from "@/lib/validation/trials";
import { traitSchema, updateSeedLotSchema, updateTraitSchema } from "@/lib/validation/catalogue";
import { AppError } from "@/lib/errors";

const { db, pool } = testDatabase();

let coordinator: Viewer;
let grower: Viewer;
let seasonId: number;
let siteId: number;


async function user(role: Viewer["role"], name: string): Promise<Viewer> {
  const email = `${unique(name)}@example.test`;
  const [row] = await db.insert(s.users).values({ email, name, role, passwordHash: "x" }).$returningId();
  return { id: row!.id, email, name, role };
}

async function expectAppError(promise: Promise<unknown>, code: AppError["code"], message?: RegExp) {
  const err = await promise.then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(AppError);
  expect((err as AppError).code).toBe(code);
  if (message) expect((err as AppError).message).toMatch(message);
  return err as AppError;
}

/** Audit entries for one catalogue item, to prove a refused change left no trace. */
const auditsOf = (entity: string, id: number) => db.select().from(s.auditLog).where(and(eq(s.auditLog.entity, entity), eq(s.auditLog.entityId, String(id))));

const traitForm = (extra: Record<string, string> = {}) =>
  traitSchema.parse({ name: "Stem length", code: unique("stem").replace(/-/g, "_").slice(0, 38), valueType: "number", unit: "cm", minValue: "0", maxValue: "150", ...extra });

/** A crop with two varieties and a lot each; the first variety and its lot are an entry in a laid-out trial. */
async function cropInTrial() {
  const cropId = await insertCrop(coordinator, { name: unique("Zinnia"), cropGroup: "flowers" });
  const used = await insertVariety(coordinator, { cropId, name: "Queen Lime" });
  const usedLot = await insertSeedLot(coordinator, { varietyId: used, source: "Hill Seeds", lotCode: "Q1", labelGerminationPct: 85, treated: false });
  const spare = await insertVariety(coordinator, { cropId, name: "Benary Giant" });
  const spareLot = await insertSeedLot(coordinator, { varietyId: spare, source: "Hill Seeds", lotCode: "B1", treated: false });
  const traitId = await insertTrait(coordinator, traitForm());
  const trialId = await createTrial(
    coordinator,
    createTrialSchema.parse({ seasonId: String(seasonId), cropId: String(cropId), code: unique("Z").toUpperCase().slice(0, 30), title: "Zinnias", design: "rcbd", blocks: "2", plotUnit: "bed_row", plotSize: "8", seedsPerCell: "1", [`trait_${traitId}`]: "on" }),
  );
  await addTrialEntry(coordinator, { trialId, varietyId: used, seedLotId: usedLot, isCheck: false });
  await addTrialEntry(coordinator, { trialId, varietyId: spare, isCheck: false });
  await enrolTrialSite(coordinator, { trialId, siteId, sownOn: "2027-04-01" });
  await randomiseTrialSite(coordinator, { trialId, siteId });
  return { cropId, used, usedLot, spare, spareLot, traitId, trialId };
}

beforeAll(async () => {
  coordinator = await user("coordinator", "Coord");
  grower = await user("cooperator", "Grower");
  const [program] = await db.insert(s.programs).values({ slug: unique("prog"), name: unique("Program") }).$returningId();
  await db.insert(s.programCoordinators).values({ programId: program!.id, userId: coordinator.id });
  const [season] = await db.insert(s.seasons).values({ programId: program!.id, name: "Summer", year: 2027 }).$returningId();
  seasonId = season!.id;
  siteId = await insertSite(coordinator, { name: unique("Catalogue farm"), kind: "farm", region: "West", growingSetup: "field" });
});

afterAll(async () => {
  await pool.end();
});

describe("editing catalogue items", () => {
  it("saves edits to a crop, variety, seed lot and trait, each with its old and new values in the audit log", async () => {
    const cropId = await insertCrop(coordinator, { name: unique("Cosmos"), cropGroup: "flowers" });
    const newName = unique("Cosmos bipinnatus");
    await updateCrop(coordinator, { cropId, name: newName, cropGroup: "herbs", scientificName: "Cosmos bipinnatus" });
    expect((await listCrops(coordinator)).find((c) => c.id === cropId)).toMatchObject({ name: newName, cropGroup: "herbs", scientificName: "Cosmos bipinnatus" });

    const varietyId = await insertVariety(coordinator, { cropId, name: "Sensation" });
    await updateVariety(coordinator, { varietyId, cropId, name: "Sensation Mix", description: "Tall" });
    expect((await listVarieties(coordinator)).find((v) => v.id === varietyId)).toMatchObject({ name: "Sensation Mix", description: "Tall" });

    const lotId = await insertSeedLot(coordinator, { varietyId, source: "Field Co", lotCode: "S-1", treated: false });
    await updateSeedLot(coordinator, updateSeedLotSchema.parse({ seedLotId: String(lotId), varietyId: String(varietyId), source: "Field Co", lotCode: "S-1b", labelGerminationPct: "91", treated: "on", treatment: "Thiram" }));
    expect((await listSeedLots(coordinator)).find((l) => l.id === lotId)).toMatchObject({ lotCode: "S-1b", labelGerminationPct: 91, treated: true, treatment: "Thiram" });

    const traitId = await insertTrait(coordinator, traitForm());
    const code = unique("height").replace(/-/g, "_").slice(0, 38);
    await updateTrait(coordinator, updateTraitSchema.parse({ traitId: String(traitId), name: "Plant height", code, valueType: "number", unit: "cm", minValue: "0", maxValue: "300", dueNote: "At first flower" }));
    expect((await listTraits(coordinator)).find((t) => t.id === traitId)).toMatchObject({ name: "Plant height", code, maxValue: 300, dueNote: "At first flower" });

    const [cropAudit] = (await auditsOf("crop", cropId)).filter((a) => a.action === "update");
    expect(cropAudit!.oldValue).toMatchObject({ cropGroup: "flowers" });
    expect(cropAudit!.newValue).toMatchObject({ name: newName, cropGroup: "herbs" });
    expect((await auditsOf("seed_lot", lotId)).map((a) => a.action)).toEqual(["create", "update"]);
  });

  it("refuses a name another item already has, with a field message, and keeps the old name", async () => {
    const taken = unique("Taken crop");
    await insertCrop(coordinator, { name: taken, cropGroup: "roots" });
    const cropId = await insertCrop(coordinator, { name: unique("Carrot"), cropGroup: "roots" });
    const err = await expectAppError(updateCrop(coordinator, { cropId, name: taken, cropGroup: "roots" }), "conflict", /already in the catalogue/);
    expect(err.fieldErrors?.name).toBeDefined();
    expect((await listCrops(coordinator)).find((c) => c.id === cropId)!.name).not.toBe(taken);
    expect((await auditsOf("crop", cropId)).map((a) => a.action)).toEqual(["create"]);
  });

  it("keeps frozen trials intact: a variety or lot in a trial cannot move, but names and notes can be corrected", async () => {
    const t = await cropInTrial();
    const otherCrop = await insertCrop(coordinator, { name: unique("Celosia"), cropGroup: "flowers" });
    const moved = await expectAppError(updateVariety(coordinator, { varietyId: t.used, cropId: otherCrop, name: "Queen Lime" }), "conflict", /entry in trial .*must stay with its crop/);
    expect(moved.fieldErrors?.cropId).toBeDefined();
    await expectAppError(
      updateSeedLot(coordinator, updateSeedLotSchema.parse({ seedLotId: String(t.usedLot), varietyId: String(t.spare), source: "Hill Seeds", lotCode: "Q1", labelGerminationPct: "85" })),
      "conflict",
      /must stay with its variety/,
    );
    const [variety] = await db.select().from(s.varieties).where(eq(s.varieties.id, t.used));
    expect(variety!.cropId).toBe(t.cropId);
    const [lot] = await db.select().from(s.seedLots).where(eq(s.seedLots.id, t.usedLot));
    expect(lot!.varietyId).toBe(t.used);

    await updateVariety(coordinator, { varietyId: t.used, cropId: t.cropId, name: "Queen Lime Orange", description: "Renamed by the breeder" });
    // A spare variety in no trial may still move to another crop.
    const loose = await insertVariety(coordinator, { cropId: t.cropId, name: "Loose" });
    await updateVariety(coordinator, { varietyId: loose, cropId: otherCrop, name: "Loose" });
    expect((await db.select().from(s.varieties).where(eq(s.varieties.id, loose)))[0]!.cropId).toBe(otherCrop);
  });

  it("fixes a lot's label germination and treatment while a trial using it is published, and frees them when it is withdrawn", async () => {
    const t = await cropInTrial();
    const form = (extra: Record<string, string>) => updateSeedLotSchema.parse({ seedLotId: String(t.usedLot), varietyId: String(t.used), source: "Hill Seeds", lotCode: "Q1", labelGerminationPct: "85", ...extra });
    await db.update(s.trials).set({ status: "published" }).where(eq(s.trials.id, t.trialId));
    const err = await expectAppError(updateSeedLot(coordinator, form({ labelGerminationPct: "70" })), "conflict", /published results of trial .*Withdraw/);
    expect(err.fieldErrors?.labelGerminationPct).toBeDefined();
    await expectAppError(updateSeedLot(coordinator, form({ treated: "on", treatment: "Captan" })), "conflict", /published/);
    expect((await db.select().from(s.seedLots).where(eq(s.seedLots.id, t.usedLot)))[0]).toMatchObject({ labelGerminationPct: 85, treated: false });
    // The lot code is a name for the coordinator, not a published figure.
    await updateSeedLot(coordinator, form({ lotCode: "Q1-A" }));
    await db.update(s.trials).set({ status: "analysing" }).where(eq(s.trials.id, t.trialId));
    await updateSeedLot(coordinator, form({ lotCode: "Q1-A", labelGerminationPct: "70" }));
    expect((await db.select().from(s.seedLots).where(eq(s.seedLots.id, t.usedLot)))[0]).toMatchObject({ lotCode: "Q1-A", labelGerminationPct: 70 });
  });

  it("keeps what a trait's values mean once a trial using it is laid out, and never changes built-in traits", async () => {
    const t = await cropInTrial();
    const [trait] = await db.select().from(s.traits).where(eq(s.traits.id, t.traitId));
    const form = (extra: Record<string, string>) =>
      updateTraitSchema.parse({ traitId: String(t.traitId), name: trait!.name, code: trait!.code, valueType: "number", unit: "cm", minValue: "0", maxValue: "150", ...extra });
    const err = await expectAppError(updateTrait(coordinator, form({ valueType: "count", maxValue: "40" })), "conflict", /Only the name, unit, timing note and description/);
    expect(Object.keys(err.fieldErrors ?? {}).sort()).toEqual(["maxValue", "valueType"]);
    await updateTrait(coordinator, form({ name: "Stem length to first node", unit: "mm", description: "Measure the tallest stem." }));
    expect((await db.select().from(s.traits).where(eq(s.traits.id, t.traitId)))[0]).toMatchObject({ name: "Stem length to first node", unit: "mm", valueType: "number", maxValue: 150 });

    const [builtIn] = await db.insert(s.traits).values({ code: unique("builtin").replace(/-/g, "_").slice(0, 38), name: "Built-in count", valueType: "count", builtIn: true }).$returningId();
    await expectAppError(updateTrait(coordinator, updateTraitSchema.parse({ traitId: String(builtIn!.id), name: "Renamed", code: "renamed_x", valueType: "count" })), "conflict", /Built-in traits/);
    await expectAppError(deleteTrait(coordinator, { traitId: builtIn!.id }), "conflict", /Built-in traits/);
    expect(await db.select().from(s.traits).where(eq(s.traits.id, builtIn!.id))).toHaveLength(1);
    expect(await auditsOf("trait", builtIn!.id)).toHaveLength(0);
  });
});

describe("deleting catalogue items", () => {
  it("deletes items nothing uses and logs what was deleted", async () => {
    const cropId = await insertCrop(coordinator, { name: unique("Radish"), cropGroup: "roots" });
    const varietyId = await insertVariety(coordinator, { cropId, name: "French Breakfast" });
    const lotId = await insertSeedLot(coordinator, { varietyId, source: "Root Co", lotCode: "R1", treated: false });
    const traitId = await insertTrait(coordinator, traitForm());
    await deleteSeedLot(coordinator, { seedLotId: lotId });
    await deleteVariety(coordinator, { varietyId });
    await deleteCrop(coordinator, { cropId });
    await deleteTrait(coordinator, { traitId });
    expect(await db.select().from(s.crops).where(eq(s.crops.id, cropId))).toHaveLength(0);
    expect(await db.select().from(s.varieties).where(eq(s.varieties.id, varietyId))).toHaveLength(0);
    expect(await db.select().from(s.seedLots).where(eq(s.seedLots.id, lotId))).toHaveLength(0);
    expect(await db.select().from(s.traits).where(eq(s.traits.id, traitId))).toHaveLength(0);
    const [deleted] = (await auditsOf("variety", varietyId)).filter((a) => a.action === "delete");
    expect(deleted!.oldValue).toMatchObject({ name: "French Breakfast", cropId });
  });

  it("refuses to delete anything in use, says why in plain words, and writes nothing", async () => {
    const t = await cropInTrial();
    const refusals: [() => Promise<unknown>, RegExp, string, number][] = [
      [() => deleteCrop(coordinator, { cropId: t.cropId }), /cannot be deleted because it is the crop of trial /, "crop", t.cropId],
      [() => deleteVariety(coordinator, { varietyId: t.used }), /Queen Lime cannot be deleted because it is an entry in trial /, "variety", t.used],
      // An entry without a lot still ties the variety to the trial.
      [() => deleteVariety(coordinator, { varietyId: t.spare }), /Benary Giant cannot be deleted because it is an entry in trial /, "variety", t.spare],
      [() => deleteSeedLot(coordinator, { seedLotId: t.usedLot }), /Lot Q1 cannot be deleted because an entry in trial .* uses it/, "seed_lot", t.usedLot],
      [() => deleteTrait(coordinator, { traitId: t.traitId }), /cannot be deleted because it is recorded in trial /, "trait", t.traitId],
    ];
    for (const [attempt, message, entity, id] of refusals) {
      await expectAppError(attempt(), "conflict", message);
      expect((await auditsOf(entity, id)).filter((a) => a.action === "delete")).toHaveLength(0);
    }
    expect(await db.select().from(s.crops).where(eq(s.crops.id, t.cropId))).toHaveLength(1);
    expect(await db.select().from(s.varieties).where(eq(s.varieties.cropId, t.cropId))).toHaveLength(2);
    expect(await db.select().from(s.seedLots).where(eq(s.seedLots.id, t.usedLot))).toHaveLength(1);
    expect(await db.select().from(s.traits).where(eq(s.traits.id, t.traitId))).toHaveLength(1);

    // Not in a trial, but still holding a lot: the lot goes first.
    const cropId = await insertCrop(coordinator, { name: unique("Beet"), cropGroup: "roots" });
    const varietyId = await insertVariety(coordinator, { cropId, name: "Chioggia" });
    await insertSeedLot(coordinator, { varietyId, source: "Root Co", lotCode: "C1", treated: false });
    await expectAppError(deleteVariety(coordinator, { varietyId }), "conflict", /still has 1 seed lot\. Delete those first/);
    await expectAppError(deleteCrop(coordinator, { cropId }), "conflict", /still has 1 variety\. Delete those first/);
    expect(await db.select().from(s.varieties).where(eq(s.varieties.id, varietyId))).toHaveLength(1);
  });

  it("shows how many trials use each item, so the tables can warn before a refusal", async () => {
    const t = await cropInTrial();
    expect((await listCrops(coordinator)).find((c) => c.id === t.cropId)).toMatchObject({ varieties: 2, trials: 1 });
    expect((await listVarieties(coordinator)).find((v) => v.id === t.used)).toMatchObject({ seedLots: 1, trials: 1 });
    expect((await listSeedLots(coordinator)).find((l) => l.id === t.spareLot)).toMatchObject({ trials: 0 });
    expect((await listTraits(coordinator)).find((tr) => tr.id === t.traitId)).toMatchObject({ trials: 1 });
  });

  it("lets only staff change the catalogue, and answers not found for items that are gone", async () => {
    const cropId = await insertCrop(coordinator, { name: unique("Pea"), cropGroup: "legumes" });
    await expectAppError(updateCrop(grower, { cropId, name: "Hacked", cropGroup: "legumes" }), "forbidden");
    await expectAppError(deleteCrop(grower, { cropId }), "forbidden");
    expect(await listCrops(grower)).toEqual([]);
    expect((await db.select().from(s.crops).where(eq(s.crops.id, cropId)))[0]!.name).not.toBe("Hacked");
    await expectAppError(deleteCrop(coordinator, { cropId: 999_999_999 }), "not_found", /no longer in the catalogue/);
    await expectAppError(updateVariety(coordinator, { varietyId: 999_999_999, cropId, name: "Ghost" }), "not_found");
  });
});
