// A trial records its traits in the order a grower meets them (seeds sown first), the coordinator can move
// them, and the form, sheets and analysis follow; editing the trait set keeps places and directions.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, asc, eq, inArray } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_SECOND_PROGRAM, DEMO_STAFF } from "@/db/demo-data";
import { testDatabase, unique } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { entryColumns } from "@/lib/domain/observations/columns";
import { sheetColumns } from "@/lib/domain/design/cautions";

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { createTrial, editTrialDesign, moveTrialTrait, setTraitDirection } = await import("@/server/trials/design");
const { listTrialTraits } = await import("@/db/queries/observations");
const { pool: appPool, db: appDb } = await import("@/db/index");

const { db, pool } = testDatabase();
let rosa: Viewer;
let trialId: number;
const codes = ["marketable_yield", "emergence_date", "plot_notes", "seeds_sown", "emergence_count", "quality"];
let traitId: Record<string, number>;

const order = async () =>
  (await db.select({ code: s.traits.code }).from(s.trialTraits).innerJoin(s.traits, eq(s.traits.id, s.trialTraits.traitId)).where(eq(s.trialTraits.trialId, trialId)).orderBy(asc(s.trialTraits.sortOrder))).map((r) => r.code);

beforeAll(async () => {
  rosa = await demoViewer(db, DEMO_STAFF[1].email);
  const rows = await db.select({ id: s.traits.id, code: s.traits.code }).from(s.traits).where(and(inArray(s.traits.code, codes), eq(s.traits.builtIn, true)));
  traitId = Object.fromEntries(rows.map((r) => [r.code, r.id]));
  const [season] = await db.select({ id: s.seasons.id }).from(s.seasons).where(eq(s.seasons.name, "Winter 2026–27"));
  const [crop] = await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Lettuce"));
  trialId = await createTrial(rosa, {
    seasonId: season!.id,
    cropId: crop!.id,
    code: unique("ORD").toUpperCase().replace(/[^A-Z0-9-]/g, "").slice(0, 30),
    title: "Trait order check",
    design: "rcbd",
    blocks: 3,
    plotUnit: "insert",
    plotSize: 6,
    seedsPerCell: 1,
    // as the form sends them: alphabetical by name
    traitIds: ["emergence_date", "marketable_yield", "quality", "plot_notes", "seeds_sown", "emergence_count"].map((c) => traitId[c]!),
  });
});

afterAll(async () => {
  await db.delete(s.trials).where(eq(s.trials.id, trialId));
  await pool.end();
  await appPool.end();
});

describe("the order of a trial's traits", () => {
  it("starts with seeds sown, then what falls due by day, then harvest-timed traits, notes last", async () => {
    expect(await order()).toEqual(["seeds_sown", "emergence_count", "emergence_date", "marketable_yield", "quality", "plot_notes"]);
  });

  it("moves a trait up or down, and the form's columns and the field sheet follow", async () => {
    await moveTrialTrait(rosa, { trialId, traitId: traitId.quality!, direction: "up" });
    expect(await order()).toEqual(["seeds_sown", "emergence_count", "emergence_date", "quality", "marketable_yield", "plot_notes"]);
    const traits = await listTrialTraits(appDb, trialId);
    expect([...new Set(entryColumns(traits).map((c) => c.traitCode))]).toEqual(await order());
    const sheet = sheetColumns(traits.map((t) => ({ ...t, dueDaysAfterSowing: t.dueDaysAfterSowing })), () => null);
    expect(sheet[0]!.heading).toMatch(/^Seeds sown/);
    expect([...new Set(sheet.map((c) => c.traitId))]).toEqual(traits.map((t) => t.id));
    // Moving the first trait up is allowed and changes nothing.
    await moveTrialTrait(rosa, { trialId, traitId: traitId.seeds_sown!, direction: "up" });
    expect((await order())[0]).toBe("seeds_sown");
  });

  it("keeps places and directions of the traits that stay when the trait set is edited", async () => {
    await setTraitDirection(rosa, { trialId, traitId: traitId.emergence_date!, betterWhen: "neither" });
    const before = await order();
    await editTrialDesign(rosa, {
      trialId,
      title: "Trait order check",
      design: "rcbd",
      blocks: 3,
      plotUnit: "insert",
      plotSize: 6,
      seedsPerCell: 1,
      traitIds: before.filter((c) => c !== "marketable_yield").map((c) => traitId[c]!),
    });
    expect(await order()).toEqual(before.filter((c) => c !== "marketable_yield"));
    const [row] = await db.select({ b: s.trialTraits.betterWhen }).from(s.trialTraits).where(and(eq(s.trialTraits.trialId, trialId), eq(s.trialTraits.traitId, traitId.emergence_date!)));
    expect(row!.b).toBe("neither");
  });

  it("is refused to another program's coordinator and to a trait the trial does not record", async () => {
    const owen = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
    const before = await order();
    await expect(moveTrialTrait(owen, { trialId, traitId: traitId.quality!, direction: "down" })).rejects.toMatchObject({ code: "not_found" });
    await expect(moveTrialTrait(rosa, { trialId, traitId: traitId.marketable_yield!, direction: "down" })).rejects.toThrow("That trait is not recorded in this trial.");
    expect(await order()).toEqual(before);
  });
});
