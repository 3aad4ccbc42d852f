// Seasons: coordinators (of their own programs) and admins create, edit and close them; a closed season
// takes no new trials; the trial list filters by season.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { testDatabase, unique } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { addSeason, changeSeason, closeOrReopenSeason } = await import("@/server/actions/seasons");
const { createTrial } = await import("@/server/actions/trials");
const { getTrialFormOptions } = await import("@/db/queries/trials");
const { listTrialsForViewer } = await import("@/db/queries/overview");
const { listSeasonsForStaff } = await import("@/db/queries/seasons");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let rosa: Viewer;
let owen: Viewer;
let admin: Viewer;
let grower: Viewer;
let tamarackId: number;
let juniperId: number;
let lettuceCropId: number;
const createdSeasons: number[] = [];

/** Runs a form action as `viewer`, the way the portal does. */
async function as(viewer: Viewer, action: (prev: null, form: FormData) => Promise<unknown>, fields: Record<string, string | number>) {
  auth.viewer = viewer;
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, String(v));
  type Result = { ok: boolean; message?: string; formError?: string; fieldErrors?: Record<string, string[]> };
  try {
    return (await action(null, form)) as Result;
  } catch (e) {
    // Creating a trial answers with a redirect to its page.
    if (e && typeof e === "object" && "digest" in e && String(e.digest).startsWith("NEXT_REDIRECT")) return { ok: true } as Result;
    throw e;
  }
}

async function seasonNamed(name: string) {
  const [row] = await db.select().from(s.seasons).where(eq(s.seasons.name, name));
  if (row && !createdSeasons.includes(row.id)) createdSeasons.push(row.id);
  return row ?? null;
}

const auditOf = (seasonId: number) => db.select({ action: s.auditLog.action, actorId: s.auditLog.actorId }).from(s.auditLog).where(and(eq(s.auditLog.entity, "season"), eq(s.auditLog.entityId, String(seasonId)))).orderBy(s.auditLog.id);

const trialFields = (seasonId: number, code: string) => ({ seasonId, cropId: lettuceCropId, code, title: "Lettuce for the next spring", design: "rcbd", blocks: 4, plotUnit: "insert", plotSize: 6, seedsPerCell: 1 });

beforeAll(async () => {
  [rosa, owen, admin, grower] = await Promise.all([
    demoViewer(db, DEMO_STAFF[1].email),
    demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email),
    demoViewer(db, DEMO_STAFF[0].email),
    demoViewer(db, DEMO_SITES[0].grower.email),
  ]);
  const programs = await db.select({ id: s.programs.id, slug: s.programs.slug }).from(s.programs);
  juniperId = programs.find((p) => p.slug === DEMO_SECOND_PROGRAM.slug)!.id;
  tamarackId = programs.find((p) => p.slug === "tamarack-valley")!.id;
  lettuceCropId = (await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Lettuce")))[0]!.id;
});

afterAll(async () => {
  auth.viewer = null;
  if (createdSeasons.length) {
    await db.delete(s.trials).where(inArray(s.trials.seasonId, createdSeasons));
    await db.delete(s.seasons).where(inArray(s.seasons.id, createdSeasons));
  }
  await pool.end();
  await appPool.end();
});

describe("seasons", () => {
  it("a coordinator creates, edits and closes a season of her program, each change with its audit entry", async () => {
    const name = unique("Spring");
    const added = await as(rosa, addSeason, { name, year: 2027, startsOn: "2027-03-01", endsOn: "2027-06-30" });
    expect(added).toMatchObject({ ok: true });
    const season = (await seasonNamed(name))!;
    expect(season).toMatchObject({ programId: tamarackId, year: 2027, startsOn: "2027-03-01", endsOn: "2027-06-30", closedAt: null });

    const renamed = `${name} (tunnel)`;
    expect(await as(rosa, changeSeason, { seasonId: season.id, name: renamed, year: 2027, startsOn: "2027-02-15", endsOn: "" })).toMatchObject({ ok: true });
    expect((await seasonNamed(renamed))!).toMatchObject({ id: season.id, startsOn: "2027-02-15", endsOn: null });

    const closed = await as(rosa, closeOrReopenSeason, { seasonId: season.id, closed: "true" });
    expect(closed).toMatchObject({ ok: true, message: `${renamed} is closed. It takes no new trials; its trials carry on.` });
    expect((await seasonNamed(renamed))!.closedAt).not.toBeNull();
    expect((await auditOf(season.id)).map((a) => [a.action, a.actorId])).toEqual([["create", rosa.id], ["update", rosa.id], ["close", rosa.id]]);
  });

  it("a season's dates and year are checked, and two seasons of one program cannot share a name", async () => {
    const bad = await as(rosa, addSeason, { name: unique("Backwards"), year: 27, startsOn: "2027-06-01", endsOn: "2027-03-01" });
    expect(bad.ok).toBe(false);
    expect(bad.fieldErrors?.year).toEqual(["Enter a year from 2000 to 2100."]);
    expect(bad.fieldErrors?.endsOn).toEqual(["The last day comes before the first day. Check both dates."]);
    const dup = await as(rosa, addSeason, { name: "Spring 2026", year: 2026 });
    expect(dup).toMatchObject({ ok: false, fieldErrors: { name: ["This program already has a season with this name."] } });
  });

  it("a closed season refuses new trials with a plain message, and the new-trial form lists only open seasons", async () => {
    const name = unique("Closing");
    await as(rosa, addSeason, { name, year: 2027 });
    const season = (await seasonNamed(name))!;
    expect((await getTrialFormOptions(rosa))!.seasons.map((x) => x.id)).toContain(season.id);
    const first = await as(rosa, createTrial, trialFields(season.id, unique("OPEN").slice(0, 20)));
    expect(first, JSON.stringify(first)).toMatchObject({ ok: true });

    await as(rosa, closeOrReopenSeason, { seasonId: season.id, closed: "true" });
    expect((await getTrialFormOptions(rosa))!.seasons.map((x) => x.id)).not.toContain(season.id);
    const trialsBefore = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.seasonId, season.id));
    // An admin is refused as well: the rule is the season's, not the role's.
    for (const viewer of [rosa, admin]) {
      const refused = await as(viewer, createTrial, trialFields(season.id, unique("SHUT").slice(0, 20)));
      expect(refused).toMatchObject({ ok: false, formError: `${name} is closed, so it takes no new trials. Choose an open season, or open a new one on the Seasons page.` });
    }
    expect(await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.seasonId, season.id))).toEqual(trialsBefore);

    // Reopened, it takes trials again.
    expect(await as(rosa, closeOrReopenSeason, { seasonId: season.id, closed: "false" })).toMatchObject({ ok: true, message: `${name} is open again for new trials.` });
    expect(await as(rosa, createTrial, trialFields(season.id, unique("AGAIN").slice(0, 20)))).toMatchObject({ ok: true });
  });

  it("another program's coordinator cannot edit or close a season, nor add one to a program she does not run; a grower cannot at all", async () => {
    const name = unique("Rosa only");
    await as(rosa, addSeason, { name, year: 2027 });
    const season = (await seasonNamed(name))!;
    const notYours = "That season does not exist or is not in your programs.";
    expect(await as(owen, changeSeason, { seasonId: season.id, name: "Taken over", year: 2027 })).toMatchObject({ ok: false, formError: notYours });
    expect(await as(owen, closeOrReopenSeason, { seasonId: season.id, closed: "true" })).toMatchObject({ ok: false, formError: notYours });
    expect(await as(owen, addSeason, { programId: tamarackId, name: unique("Sneaky"), year: 2027 })).toMatchObject({ ok: false, formError: "Choose one of your programs." });
    expect(await as(grower, addSeason, { name: unique("Grower's"), year: 2027 })).toMatchObject({ ok: false, formError: "Your account does not have access to this." });
    expect(await as(grower, closeOrReopenSeason, { seasonId: season.id, closed: "true" })).toMatchObject({ ok: false });
    expect((await seasonNamed(name))!).toMatchObject({ name, closedAt: null });
    expect((await auditOf(season.id)).map((a) => a.action)).toEqual(["create"]);
    // Owen does not even see it; an admin sees it and may add seasons to any program.
    expect((await listSeasonsForStaff(owen)).map((x) => x.id)).not.toContain(season.id);
    expect((await listSeasonsForStaff(admin)).map((x) => x.id)).toContain(season.id);
    const adminName = unique("Admin's");
    expect(await as(admin, addSeason, { programId: juniperId, name: adminName, year: 2028 })).toMatchObject({ ok: true });
    expect((await seasonNamed(adminName))!.programId).toBe(juniperId);
  });

  it("the trial list shows one season's trials when asked", async () => {
    const [spring] = await db.select({ id: s.seasons.id }).from(s.seasons).where(and(eq(s.seasons.name, "Spring 2026"), eq(s.seasons.programId, tamarackId)));
    const all = await listTrialsForViewer(rosa);
    const springOnly = await listTrialsForViewer(rosa, { seasonId: spring!.id });
    expect(springOnly.length).toBeGreaterThan(0);
    expect(springOnly.length).toBeLessThan(all.length);
    expect(new Set(springOnly.map((t) => t.season))).toEqual(new Set(["Spring 2026"]));
    // Another program's season filters to nothing for Rosa.
    const [autumn] = await db.select({ id: s.seasons.id }).from(s.seasons).where(eq(s.seasons.programId, juniperId));
    expect(await listTrialsForViewer(rosa, { seasonId: autumn!.id })).toEqual([]);
  });
});
