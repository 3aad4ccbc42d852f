// Planning the next season from a trial copies its set-up, traits, entries and sites into a new draft
// and links the two; nothing of another program can be reached, and a refused plan writes nothing.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, asc, count, eq, inArray, ne } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_SECOND_PROGRAM, DEMO_STAFF } from "@/db/demo-data";
import { testDatabase, unique } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { rollTrialForward, setTraitDirection, setEntrySeedLot } = await import("@/server/trials/design");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let rosa: Viewer;
let owen: Viewer;
let sourceId: number;
let winterId: number;
const created: number[] = [];

const newCode = () => unique("RF").toUpperCase().replace(/[^A-Z0-9-]/g, "").slice(0, 30);
const trialCount = async () => (await db.select({ n: count() }).from(s.trials))[0]!.n;

beforeAll(async () => {
  rosa = await demoViewer(db, DEMO_STAFF[1].email);
  owen = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
  const [t] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  sourceId = t!.id;
  const [season] = await db.select({ id: s.seasons.id }).from(s.seasons).where(eq(s.seasons.name, "Winter 2026–27"));
  winterId = season!.id;
});

afterAll(async () => {
  if (created.length) await db.delete(s.trials).where(inArray(s.trials.id, created));
  const [harvest] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "harvest_date"));
  await db.update(s.trialTraits).set({ betterWhen: null }).where(and(eq(s.trialTraits.trialId, sourceId), eq(s.trialTraits.traitId, harvest!.id)));
  await pool.end();
  await appPool.end();
});

describe("planning the next season from a trial", () => {
  it("copies crop, set-up, traits in order with their directions, entries with the check, and sites, into a linked draft", async () => {
    const [harvest] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "harvest_date"));
    await setTraitDirection(rosa, { trialId: sourceId, traitId: harvest!.id, betterWhen: "lower" });
    const code = newCode();
    const { trialId, entries, sites } = await rollTrialForward(rosa, { trialId: sourceId, seasonId: winterId, code, title: "Leaf lettuce, second year" });
    created.push(trialId);

    const [source] = await db.select().from(s.trials).where(eq(s.trials.id, sourceId));
    const [copy] = await db.select().from(s.trials).where(eq(s.trials.id, trialId));
    expect(copy).toMatchObject({
      code,
      title: "Leaf lettuce, second year",
      status: "draft",
      seasonId: winterId,
      programId: source!.programId,
      cropId: source!.cropId,
      design: source!.design,
      blocks: source!.blocks,
      plotUnit: source!.plotUnit,
      plotSize: source!.plotSize,
      seedsPerCell: source!.seedsPerCell,
      protocol: source!.protocol,
      previousTrialId: sourceId,
    });

    const traitsOf = (id: number) =>
      db.select({ traitId: s.trialTraits.traitId, betterWhen: s.trialTraits.betterWhen }).from(s.trialTraits).where(eq(s.trialTraits.trialId, id)).orderBy(asc(s.trialTraits.sortOrder));
    expect(await traitsOf(trialId)).toEqual(await traitsOf(sourceId));
    expect((await traitsOf(trialId)).find((t) => t.traitId === harvest!.id)!.betterWhen).toBe("lower");

    const entriesOf = (id: number) =>
      db.select({ varietyId: s.trialEntries.varietyId, isCheck: s.trialEntries.isCheck, seedLotId: s.trialEntries.seedLotId, blindCode: s.trialEntries.blindCode }).from(s.trialEntries).where(eq(s.trialEntries.trialId, id)).orderBy(asc(s.trialEntries.entryNumber));
    const [before, after] = [await entriesOf(sourceId), await entriesOf(trialId)];
    expect(after.map((e) => [e.varietyId, e.isCheck])).toEqual(before.map((e) => [e.varietyId, e.isCheck]));
    expect(after.every((e) => e.seedLotId === null)).toBe(true);
    expect(entries).toBe(before.length);
    expect(new Set(after.map((e) => e.blindCode)).size).toBe(after.length);

    const sitesOf = (id: number) => db.select({ siteId: s.enrolments.siteId, sownOn: s.enrolments.sownOn, randomisedAt: s.enrolments.randomisedAt }).from(s.enrolments).where(eq(s.enrolments.trialId, id)).orderBy(asc(s.enrolments.siteId));
    const copiedSites = await sitesOf(trialId);
    expect(copiedSites.map((e) => e.siteId)).toEqual((await sitesOf(sourceId)).map((e) => e.siteId));
    expect(sites).toBe(copiedSites.length);
    expect(copiedSites.every((e) => e.sownOn === null && e.randomisedAt === null)).toBe(true);
    expect((await db.select({ n: count() }).from(s.plots).where(eq(s.plots.trialId, trialId)))[0]!.n).toBe(0);

    // The coordinator then picks this season's lot for an entry; a lot of another variety is refused.
    const [entry] = await db.select({ id: s.trialEntries.id, varietyId: s.trialEntries.varietyId }).from(s.trialEntries).where(eq(s.trialEntries.trialId, trialId)).orderBy(asc(s.trialEntries.entryNumber)).limit(1);
    const [ownLot] = await db.select({ id: s.seedLots.id }).from(s.seedLots).where(eq(s.seedLots.varietyId, entry!.varietyId)).limit(1);
    const [otherLot] = await db.select({ id: s.seedLots.id }).from(s.seedLots).where(ne(s.seedLots.varietyId, entry!.varietyId)).limit(1);
    await expect(setEntrySeedLot(rosa, { trialId, entryId: entry!.id, seedLotId: otherLot!.id })).rejects.toThrow("That seed lot belongs to another variety.");
    await setEntrySeedLot(rosa, { trialId, entryId: entry!.id, seedLotId: ownLot!.id });
    const [picked] = await db.select({ lot: s.trialEntries.seedLotId }).from(s.trialEntries).where(eq(s.trialEntries.id, entry!.id));
    expect(picked!.lot).toBe(ownLot!.id);
  });

  it("refuses another program's coordinator as if the trial did not exist, and writes nothing", async () => {
    const before = await trialCount();
    await expect(rollTrialForward(owen, { trialId: sourceId, seasonId: winterId, code: newCode(), title: "Not mine" })).rejects.toMatchObject({ code: "not_found" });
    expect(await trialCount()).toBe(before);
  });

  it("refuses a season of another program and a code already in use, leaving nothing half made", async () => {
    const [juniper] = await db.select({ id: s.seasons.id }).from(s.seasons).where(eq(s.seasons.name, "Autumn 2027"));
    const admin = await demoViewer(db, DEMO_STAFF[0].email);
    const before = await trialCount();
    const enrolmentsBefore = (await db.select({ n: count() }).from(s.enrolments))[0]!.n;
    await expect(rollTrialForward(admin, { trialId: sourceId, seasonId: juniper!.id, code: newCode(), title: "Wrong program" })).rejects.toThrow(/this trial's own program/);
    await expect(rollTrialForward(rosa, { trialId: sourceId, seasonId: winterId, code: "TV26-SPN", title: "Taken code" })).rejects.toThrow(/already uses this code/);
    expect(await trialCount()).toBe(before);
    expect((await db.select({ n: count() }).from(s.enrolments))[0]!.n).toBe(enrolmentsBefore);
  });
});
