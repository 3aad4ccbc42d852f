import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { entryColumns } from "@/lib/domain/observations/columns";
import { and, eq } from "drizzle-orm";
import { testDatabase, unique } from "../helpers/db";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { insertCrop, insertSeedLot, insertTrait, insertVariety } from "@/db/mutations/catalogue";
import { removeTrialEntry, createTrial, addTrialEntry, editTrialDesign, moveTrialStatus } from "@/server/trials/design";
import { enrolTrialSite, randomiseTrialSite, moveSowingDate } from "@/server/trials/enrolment";
import { insertSite } from "@/db/mutations/sites";
import { lockTrialForViewer } from "@/db/access";
import { db as appDb } from "@/db/index";
import { getPlotForViewer, getSiteLayout, getTrialDetail } from "@/db/queries/trials";
import { createTrialSchema, sowingDateSchema } from "@/lib/validation/trials";
import { scheduleForSite } from "@/lib/domain/schedule";
import { traitSchema } from "@/lib/validation/catalogue";
import { isBlindCode } from "@/lib/domain/design/blind-codes";
import { AppError } from "@/lib/errors";

const { db, pool } = testDatabase();

let coordinator: Viewer;
let outsider: Viewer; // a coordinator of another program
let grower: Viewer; // cooperator of site A
let otherGrower: Viewer; // cooperator of an unrelated site
let seasonId: number;
let cropId: number;
let traitIds: number[];
const varietyIds: number[] = [];
const lotIds: number[] = [];
let siteA: number;
let siteB: number;

async function user(role: Viewer["role"], name: string, password: string | null = "x"): Promise<Viewer> {
  const email = `${unique(name)}@example.test`;
  const [row] = await db.insert(s.users).values({ email, name, role, passwordHash: password }).$returningId();
  return { id: row!.id, email, name, role };
}


async function expectAppError(promise: Promise<unknown>, code: AppError["code"], message?: RegExp) {
  const err = await promise.then(() => null, (e: unknown) => e);
  expect(err).toBeInstanceOf(AppError);
  expect((err as AppError).code).toBe(code);
  if (message) expect((err as AppError).message).toMatch(message);
}

function trialInput(extra: Record<string, string> = {}) {
  const form: Record<string, string> = {
    seasonId: String(seasonId),
    cropId: String(cropId),
    code: unique("T").toUpperCase().slice(0, 30),
    title: "Cut-flower zinnias for tunnels",
    design: "rcbd",
    blocks: "4",
    plotUnit: "insert",
    plotSize: "6",
    seedsPerCell: "1",
    ...Object.fromEntries(traitIds.map((id) => [`trait_${id}`, "on"])),
    ...extra,
  };
  return createTrialSchema.parse(form);
}

async function trialWithEntries(n: number) {
  const trialId = await createTrial(coordinator, trialInput());
  for (let i = 0; i < n; i += 1) await addTrialEntry(coordinator, { trialId, varietyId: varietyIds[i]!, seedLotId: lotIds[i], isCheck: i === 0 });
  return trialId;
}

beforeAll(async () => {
  coordinator = await user("coordinator", "Coord");
  outsider = await user("coordinator", "Outsider");
  grower = await user("cooperator", "Grower");
  otherGrower = await user("cooperator", "Other grower");
  const [program] = await db.insert(s.programs).values({ slug: unique("prog"), name: unique("Program") }).$returningId();
  const [otherProgram] = await db.insert(s.programs).values({ slug: unique("prog"), name: unique("Program") }).$returningId();
  await db.insert(s.programCoordinators).values([{ programId: program!.id, userId: coordinator.id }, { programId: otherProgram!.id, userId: outsider.id }]);
  const [season] = await db.insert(s.seasons).values({ programId: program!.id, name: "Spring", year: 2027 }).$returningId();
  seasonId = season!.id;
  cropId = await insertCrop(coordinator, { name: unique("Zinnia"), cropGroup: "flowers" });
  for (let i = 0; i < 6; i += 1) {
    const v = await insertVariety(coordinator, { cropId, name: `Variety ${i}` });
    varietyIds.push(v);
    lotIds.push(await insertSeedLot(coordinator, { varietyId: v, source: "Test Seeds", lotCode: `L${i}`, treated: i === 1, treatment: i === 1 ? "Fungicide" : undefined }));
  }
  traitIds = [
    await insertTrait(coordinator, traitSchema.parse({ name: "Emerged", code: unique("em").replace(/-/g, "_").slice(0, 38), valueType: "count", minValue: "0", maxValue: "6", dueDaysAfterSowing: "5, 7, 10, 14" })),
  ];
  siteA = await insertSite(coordinator, { name: unique("Site A"), kind: "farm", region: "North", growingSetup: "greenhouse" });
  siteB = await insertSite(coordinator, { name: unique("Site B"), kind: "garden", region: "South", growingSetup: "indoor_lights", cooperatorName: "New Grower", cooperatorEmail: `${unique("new")}@example.test` });
  await db.insert(s.siteCooperators).values({ siteId: siteA, userId: grower.id });
  const lone = await insertSite(coordinator, { name: unique("Site C"), kind: "farm", region: "East", growingSetup: "field" });
  await db.insert(s.siteCooperators).values({ siteId: lone, userId: otherGrower.id });
});

afterAll(async () => {
  await pool.end();
});

describe("trial set-up", () => {
  it("gives each entry a unique, unambiguous blind code and refuses a duplicate variety without writing", async () => {
    const trialId = await trialWithEntries(5);
    const entries = await db.select().from(s.trialEntries).where(eq(s.trialEntries.trialId, trialId));
    expect(entries).toHaveLength(5);
    expect(new Set(entries.map((e) => e.blindCode)).size).toBe(5);
    expect(entries.every((e) => isBlindCode(e.blindCode))).toBe(true);
    await expectAppError(addTrialEntry(coordinator, { trialId, varietyId: varietyIds[0]!, isCheck: false }), "conflict", /already an entry/);
    expect(await db.select().from(s.trialEntries).where(eq(s.trialEntries.trialId, trialId))).toHaveLength(5);
  });

  it("rejects zero blocks and a trait with min above max before anything is written", () => {
    expect(createTrialSchema.safeParse({ ...trialInput(), blocks: "0" }).success).toBe(false);
    const bad = traitSchema.safeParse({ name: "Height", code: "height_x", valueType: "number", minValue: "10", maxValue: "2" });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.message).toMatch(/not be below/);
  });

  it("keeps trials of other programs out of reach", async () => {
    const trialId = await trialWithEntries(2);
    expect(await getTrialDetail(outsider, trialId)).toBeNull();
    expect(await getTrialDetail(grower, trialId)).toBeNull();
    await expectAppError(addTrialEntry(outsider, { trialId, varietyId: varietyIds[3]!, isCheck: false }), "not_found");
    await expectAppError(addTrialEntry(grower, { trialId, varietyId: varietyIds[3]!, isCheck: false }), "forbidden");
    await expectAppError(createTrial(outsider, trialInput()), "bad_request", /program you coordinate/);
  });

  it("locks a trial only for viewers who reach it: its program's staff and the growers of its sites", async () => {
    const trialId = await trialWithEntries(2);
    await enrolTrialSite(coordinator, { trialId, siteId: siteA });
    const lockedBy = (viewer: Viewer) => appDb.transaction((tx) => lockTrialForViewer(tx, viewer, trialId));
    expect((await lockedBy(coordinator)).id).toBe(trialId);
    expect((await lockedBy(grower)).id).toBe(trialId);
    await expectAppError(lockedBy(otherGrower), "not_found");
    await expectAppError(lockedBy(outsider), "not_found");
  });
});

describe("enrolment and randomisation", () => {
  it("invites a site's grower who has no account, in the same transaction as the enrolment", async () => {
    const trialId = await trialWithEntries(3);
    const result = await enrolTrialSite(coordinator, { trialId, siteId: siteB });
    expect(result.invited).toHaveLength(1);
    const [queued] = await db.select().from(s.mailOutbox).where(eq(s.mailOutbox.toAddress, result.invited[0]!));
    // The invitation itself (not the notice for growers with an account), with its one-time link.
    expect(queued?.subject).toMatch(/invited/i);
    expect(queued?.textBody).toMatch(/\/invite\/[A-Za-z0-9_-]{40,}/);
    await expectAppError(enrolTrialSite(coordinator, { trialId, siteId: siteB }), "conflict", /already enrolled/);
  });

  it("lays out each site reproducibly from its stored seed, differently across sites, each entry once per block", async () => {
    const trialId = await trialWithEntries(4);
    await enrolTrialSite(coordinator, { trialId, siteId: siteA });
    await enrolTrialSite(coordinator, { trialId, siteId: siteB });
    const a = await randomiseTrialSite(coordinator, { trialId, siteId: siteA });
    await randomiseTrialSite(coordinator, { trialId, siteId: siteB });
    const layoutA = (await getSiteLayout(coordinator, { trialId, siteId: siteA }))!;
    const layoutB = (await getSiteLayout(coordinator, { trialId, siteId: siteB }))!;
    expect(layoutA.randomSeed).toBe(a.seed);
    expect(layoutA.plots).toHaveLength(16);
    for (let block = 1; block <= 4; block += 1) {
      const codes = layoutA.plots.filter((p) => p.block === block).map((p) => p.blindCode);
      expect(new Set(codes).size).toBe(4);
    }
    expect(layoutA.plots.map((p) => p.blindCode).join()).not.toBe(layoutB.plots.map((p) => p.blindCode).join());
    // Four six-cell inserts per block: three blocks fill 12 inserts of flat 1, the fourth starts flat 2.
    expect(layoutA.plots.filter((p) => p.block === 4).every((p) => p.tray === 2)).toBe(true);

    await randomiseTrialSite(coordinator, { trialId, siteId: siteA, seed: a.seed });
    const again = (await getSiteLayout(coordinator, { trialId, siteId: siteA }))!;
    expect(again.plots.map((p) => p.blindCode)).toEqual(layoutA.plots.map((p) => p.blindCode));
    const audits = await db.select().from(s.auditLog).where(and(eq(s.auditLog.trialId, trialId), eq(s.auditLog.action, "rerandomise")));
    expect(audits).toHaveLength(1);
  });

  it("freezes entries once a site is laid out and refuses re-randomising once data exist", async () => {
    const trialId = await trialWithEntries(3);
    await enrolTrialSite(coordinator, { trialId, siteId: siteA });
    await randomiseTrialSite(coordinator, { trialId, siteId: siteA });
    await expectAppError(addTrialEntry(coordinator, { trialId, varietyId: varietyIds[4]!, isCheck: false }), "conflict", /frozen/);
    const [entry] = await db.select().from(s.trialEntries).where(eq(s.trialEntries.trialId, trialId));
    await expectAppError(removeTrialEntry(coordinator, { trialId, entryId: entry!.id }), "conflict", /frozen/);
    const form = trialInput();
    await expectAppError(editTrialDesign(coordinator, { ...form, trialId, blocks: 5 }), "conflict", /frozen/);

    const [plot] = await db.select().from(s.plots).where(eq(s.plots.trialId, trialId));
    await db.insert(s.observations).values({ plotId: plot!.id, traitId: traitIds[0]!, occasion: 5, valueNumber: 4 });
    const before = await db.select({ id: s.plots.id }).from(s.plots).where(eq(s.plots.trialId, trialId));
    await expectAppError(randomiseTrialSite(coordinator, { trialId, siteId: siteA }), "conflict", /recorded data/);
    expect(await db.select({ id: s.plots.id }).from(s.plots).where(eq(s.plots.trialId, trialId))).toEqual(before);
  });

  it("moves status one step at a time with its preconditions", async () => {
    const trialId = await trialWithEntries(2);
    await expectAppError(moveTrialStatus(coordinator, { trialId, status: "collecting" }), "conflict", /one step/);
    await moveTrialStatus(coordinator, { trialId, status: "open" });
    await enrolTrialSite(coordinator, { trialId, siteId: siteA });
    await expectAppError(moveTrialStatus(coordinator, { trialId, status: "collecting" }), "conflict", /needs a layout/);
    await randomiseTrialSite(coordinator, { trialId, siteId: siteA });
    await moveTrialStatus(coordinator, { trialId, status: "collecting" });
    await expectAppError(moveTrialStatus(coordinator, { trialId, status: "draft" }), "conflict");
  });
});

describe("who sees a site's layout", () => {
  it("shows a cooperator only their own site, with blind codes but no variety names", async () => {
    const trialId = await trialWithEntries(3);
    await enrolTrialSite(coordinator, { trialId, siteId: siteA });
    await randomiseTrialSite(coordinator, { trialId, siteId: siteA });
    const mine = await getSiteLayout(grower, { trialId, siteId: siteA });
    expect(mine).not.toBeNull();
    expect(mine!.showKey).toBe(false);
    expect(mine!.plots.every((p) => p.variety === null && p.blindCode.length === 3)).toBe(true);
    expect(await getSiteLayout(otherGrower, { trialId, siteId: siteA })).toBeNull();
    expect(await getSiteLayout(outsider, { trialId, siteId: siteA })).toBeNull();
    const staff = await getSiteLayout(coordinator, { trialId, siteId: siteA });
    expect(staff!.plots.some((p) => p.variety !== null)).toBe(true);
    expect(staff!.hasTreatedSeed).toBe(true);
    expect(await getPlotForViewer(grower, mine!.plots[0]!.id)).not.toBeNull();
    expect(await getPlotForViewer(otherGrower, mine!.plots[0]!.id)).toBeNull();
  });
});

describe("editing a trial", () => {
  it("still saves a new title after layout, but not a different trait set once data exist", async () => {
    const trialId = await trialWithEntries(2);
    await enrolTrialSite(coordinator, { trialId, siteId: siteA });
    await randomiseTrialSite(coordinator, { trialId, siteId: siteA });
    const form = trialInput();
    await editTrialDesign(coordinator, { ...form, trialId, title: "Renamed after layout" });
    const [row] = await db.select({ title: s.trials.title }).from(s.trials).where(eq(s.trials.id, trialId));
    expect(row!.title).toBe("Renamed after layout");
    const [plot] = await db.select().from(s.plots).where(eq(s.plots.trialId, trialId));
    await db.insert(s.observations).values({ plotId: plot!.id, traitId: traitIds[0]!, occasion: 5, valueNumber: 3 });
    await expectAppError(editTrialDesign(coordinator, { ...form, trialId, traitIds: [] }), "conflict", /traits can no longer change/);
  });
});

describe("changing a site's sowing date", () => {
  async function laidOutSite(sownOn?: string) {
    const trialId = await trialWithEntries(3);
    const { enrolmentId } = await enrolTrialSite(coordinator, { trialId, siteId: siteA, sownOn });
    await randomiseTrialSite(coordinator, { trialId, siteId: siteA });
    return { trialId, enrolmentId };
  }
  const sowing = async (enrolmentId: number) => (await db.select({ sownOn: s.enrolments.sownOn }).from(s.enrolments).where(eq(s.enrolments.id, enrolmentId)))[0]!.sownOn;
  const audits = async (trialId: number) => db.select().from(s.auditLog).where(and(eq(s.auditLog.trialId, trialId), eq(s.auditLog.action, "change_sowing_date")));

  it("moves the site's due dates with the new date and logs the old and new dates", async () => {
    const { trialId, enrolmentId } = await laidOutSite("2027-03-18");
    await moveTrialStatus(coordinator, { trialId, status: "open" });
    await moveTrialStatus(coordinator, { trialId, status: "collecting" });
    const result = await moveSowingDate(coordinator, { trialId, siteId: siteA, sownOn: "2027-03-21" });
    expect(result).toEqual({ changed: true, values: 0 });
    expect(await sowing(enrolmentId)).toBe("2027-03-21");
    const layout = (await getSiteLayout(coordinator, { trialId, siteId: siteA }))!;
    const due = scheduleForSite({ sownOn: layout.sownOn, plotCount: layout.plots.length, columns: entryColumns(layout.traits), recorded: new Map(), today: "2027-03-01" });
    expect(due.map((d) => d.dueOn)).toEqual(["2027-03-26", "2027-03-28", "2027-03-31", "2027-04-04"]);
    const [entry] = await audits(trialId);
    expect(entry!.oldValue).toEqual({ sownOn: "2027-03-18" });
    expect(entry!.newValue).toMatchObject({ sownOn: "2027-03-21" });
  });

  it("sets a date on a site enrolled without one, and writes nothing when the date is unchanged", async () => {
    const { trialId, enrolmentId } = await laidOutSite();
    await moveSowingDate(coordinator, { trialId, siteId: siteA, sownOn: "2027-04-02" });
    expect(await sowing(enrolmentId)).toBe("2027-04-02");
    expect(await moveSowingDate(coordinator, { trialId, siteId: siteA, sownOn: "2027-04-02" })).toEqual({ changed: false, values: 0 });
    expect(await audits(trialId)).toHaveLength(1);
  });

  it("allows an earlier date once values exist, but refuses one after a recorded value and writes nothing", async () => {
    const { trialId, enrolmentId } = await laidOutSite("2027-03-18");
    const [plot] = await db.select().from(s.plots).where(eq(s.plots.enrolmentId, enrolmentId));
    await db.insert(s.observations).values({ plotId: plot!.id, traitId: traitIds[0]!, occasion: 5, valueNumber: 4, observedOn: "2027-03-23" });
    await expectAppError(moveSowingDate(coordinator, { trialId, siteId: siteA, sownOn: "2027-03-24" }), "conflict", /dated 2027-03-23.*on or before 2027-03-23/);
    expect(await sowing(enrolmentId)).toBe("2027-03-18");
    expect(await audits(trialId)).toHaveLength(0);
    expect(await moveSowingDate(coordinator, { trialId, siteId: siteA, sownOn: "2027-03-17" })).toEqual({ changed: true, values: 1 });
    expect(await sowing(enrolmentId)).toBe("2027-03-17");
  });

  it("refuses once the trial is published or archived, and for people who do not manage the trial", async () => {
    const { trialId, enrolmentId } = await laidOutSite("2027-03-18");
    for (const status of ["published", "archived"] as const) {
      await db.update(s.trials).set({ status }).where(eq(s.trials.id, trialId));
      await expectAppError(moveSowingDate(coordinator, { trialId, siteId: siteA, sownOn: "2027-03-10" }), "conflict", status === "published" ? /Withdraw the published results/ : /archived/);
    }
    await db.update(s.trials).set({ status: "collecting" }).where(eq(s.trials.id, trialId));
    await expectAppError(moveSowingDate(outsider, { trialId, siteId: siteA, sownOn: "2027-03-10" }), "not_found");
    await expectAppError(moveSowingDate(grower, { trialId, siteId: siteA, sownOn: "2027-03-10" }), "forbidden");
    await expectAppError(moveSowingDate(coordinator, { trialId, siteId: siteB, sownOn: "2027-03-10" }), "not_found", /not enrolled/);
    expect(await sowing(enrolmentId)).toBe("2027-03-18");
    expect(await audits(trialId)).toHaveLength(0);
  });

  it("asks for a real date", () => {
    for (const bad of ["", "18/03/2027", "2027-02-30x", undefined]) {
      const parsed = sowingDateSchema.safeParse({ trialId: "1", siteId: "2", sownOn: bad });
      expect(parsed.success).toBe(false);
      expect(parsed.error!.issues[0]!.message).toMatch(/Enter the sowing date like/);
    }
  });
});
