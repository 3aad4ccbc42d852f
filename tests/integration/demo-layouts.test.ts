import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { asc, eq } from "drizzle-orm";
import { testDatabase, unique } from "../helpers/db";
import * as s from "@/db/schema";
import { DEMO_TRIALS } from "@/db/demo-data";
import type { Viewer } from "@/lib/domain/viewer";
import { createTrial, addTrialEntry } from "@/server/trials/design";
import { enrolTrialSite, randomiseTrialSite } from "@/server/trials/enrolment";
import { insertSite } from "@/db/mutations/sites";
import { insertVariety } from "@/db/mutations/catalogue";
import { createTrialSchema } from "@/lib/validation/trials";

// The demo seed lays out its sites without going through the app. These tests redo every demo layout
// with the app's own randomise action from the stored seeds and expect the very same plots.

const { db, pool } = testDatabase();
let coordinator: Viewer;


/** A site's plots as a grower would lay them out: code, block, order, flat, insert or cell, and entry number. */
async function plotsOf(enrolmentId: number) {
  return db
    .select({ plotCode: s.plots.plotCode, block: s.plots.block, position: s.plots.position, tray: s.plots.tray, traySlot: s.plots.traySlot, entryNumber: s.trialEntries.entryNumber })
    .from(s.plots)
    .innerJoin(s.trialEntries, eq(s.trialEntries.id, s.plots.entryId))
    .where(eq(s.plots.enrolmentId, enrolmentId))
    .orderBy(asc(s.plots.block), asc(s.plots.position));
}

let seasonId: number;

beforeAll(async () => {
  // The clones live in a program of their own, so the demo program keeps exactly its demo trials.
  const email = `${unique("layout")}@example.test`;
  const [u] = await db.insert(s.users).values({ email, name: "Layout checker", role: "coordinator", passwordHash: "x" }).$returningId();
  coordinator = { id: u!.id, email, name: "Layout checker", role: "coordinator" };
  const [program] = await db.insert(s.programs).values({ slug: unique("layout"), name: unique("Layout checks") }).$returningId();
  await db.insert(s.programCoordinators).values({ programId: program!.id, userId: coordinator.id });
  const [season] = await db.insert(s.seasons).values({ programId: program!.id, name: "Checks", year: 2027 }).$returningId();
  seasonId = season!.id;
});

afterAll(async () => {
  await pool.end();
});

describe("demo layouts", () => {
  for (const demo of DEMO_TRIALS) {
    it(`${demo.code}: every site's plots are what the randomise action draws from its stored seed`, async () => {
      const [trial] = await db.select().from(s.trials).where(eq(s.trials.code, demo.code));
      expect(trial, `demo trial ${demo.code} missing; reseed the test database`).toBeDefined();
      const entries = await db.select().from(s.trialEntries).where(eq(s.trialEntries.trialId, trial!.id)).orderBy(asc(s.trialEntries.entryNumber));
      const enrolments = await db.select().from(s.enrolments).where(eq(s.enrolments.trialId, trial!.id)).orderBy(asc(s.enrolments.id));
      expect(enrolments).toHaveLength(demo.siteIndexes.length);

      // The same design and entries in a fresh trial, with as many fresh sites enrolled in the same order.
      const cloneId = await createTrial(
        coordinator,
        createTrialSchema.parse({
          seasonId: String(seasonId),
          cropId: String(trial!.cropId),
          code: unique("CL").toUpperCase().slice(0, 30),
          title: `Layout check of ${demo.code}`,
          design: trial!.design,
          blocks: String(trial!.blocks),
          plotUnit: trial!.plotUnit,
          plotSize: String(trial!.plotSize),
          seedsPerCell: String(trial!.seedsPerCell),
        }),
      );
      // Entries use their own program's varieties, so the clone gets copies of the demo varieties, named apart
      // from them (a program has one variety of a crop by each name, and a variety may recur across seasons).
      for (const e of entries) {
        const [variety] = await db.select({ name: s.varieties.name }).from(s.varieties).where(eq(s.varieties.id, e.varietyId));
        const varietyId = await insertVariety(coordinator, { cropId: trial!.cropId, name: unique(variety!.name) });
        await addTrialEntry(coordinator, { trialId: cloneId, varietyId, isCheck: e.isCheck });
      }
      for (const [i, enrolment] of enrolments.entries()) {
        const siteId = await insertSite(coordinator, { name: unique(`Layout check ${i}`), kind: "farm", region: "Test", growingSetup: "greenhouse" });
        const { enrolmentId } = await enrolTrialSite(coordinator, { trialId: cloneId, siteId });
        await randomiseTrialSite(coordinator, { trialId: cloneId, siteId, seed: enrolment.randomSeed! });
        const demoPlots = await plotsOf(enrolment.id);
        expect(demoPlots).toHaveLength(demo.entries.length * demo.blocks);
        expect(demoPlots).toEqual(await plotsOf(enrolmentId));
      }
    }, 60_000);
  }

  it("packs the tray trial block by block onto 1020 flats, never splitting a block that fits in one", async () => {
    const trays = DEMO_TRIALS.filter((t) => t.plotUnit === "insert");
    expect(trays.length).toBeGreaterThan(0);
    for (const demo of trays) {
      const [trial] = await db.select().from(s.trials).where(eq(s.trials.code, demo.code));
      const enrolments = await db.select({ id: s.enrolments.id }).from(s.enrolments).where(eq(s.enrolments.trialId, trial!.id));
      for (const e of enrolments) {
        const plots = await plotsOf(e.id);
        for (let block = 1; block <= demo.blocks; block += 1) expect(new Set(plots.filter((p) => p.block === block).map((p) => p.tray)).size).toBe(1);
        const slots = plots.map((p) => `${p.tray}:${p.traySlot}`);
        expect(new Set(slots).size).toBe(plots.length);
        expect(plots.every((p) => p.traySlot! >= 1 && p.traySlot! <= 12)).toBe(true);
      }
    }
  });
});
