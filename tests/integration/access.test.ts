import { afterAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import * as s from "@/db/schema";
import { listMySites, listSiteOptions, listTrialsForViewer } from "@/db/queries/overview";
import { listLateSites, listMySchedules } from "@/server/observations/schedules";
import { countUsersByRole, getActiveViewer, listCooperators, listUsersForAdmin } from "@/db/queries/users";
import { pool as appPool } from "@/db/index";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";
import { addDays } from "@/lib/domain/schedule";

const { db, pool } = testDatabase();
afterAll(async () => {
  await pool.end();
  await appPool.end();
});


describe("role and ownership checks in the data-access layer (demo data)", () => {
  it("gives the user list only to admins", async () => {
    const admin = await demoViewer(db, DEMO_STAFF[0].email);
    const coordinator = await demoViewer(db, DEMO_STAFF[1].email);
    const grower = await demoViewer(db, DEMO_SITES[0].grower.email);
    expect((await listUsersForAdmin(admin)).length).toBeGreaterThanOrEqual(9);
    expect(await listUsersForAdmin(coordinator)).toEqual([]);
    expect(await listUsersForAdmin(grower)).toEqual([]);
    expect(await countUsersByRole(grower)).toEqual([]);
  });

  it("never returns password hashes in the admin user list", async () => {
    const admin = await demoViewer(db, DEMO_STAFF[0].email);
    const rows = await listUsersForAdmin(admin);
    for (const row of rows) expect(Object.keys(row)).not.toContain("passwordHash");
    expect(JSON.stringify(rows)).not.toContain("$argon2");
  });

  it("shows trials, late sites, growers and site lists to staff but not to cooperators", async () => {
    const coordinator = await demoViewer(db, DEMO_STAFF[1].email);
    const grower = await demoViewer(db, DEMO_SITES[0].grower.email);
    expect((await listTrialsForViewer(coordinator)).map((t) => t.code).sort()).toEqual(DEMO_TRIALS.map((t) => t.code).sort());
    expect(await listTrialsForViewer(grower)).toEqual([]);
    expect(await listLateSites(grower)).toEqual([]);
    expect(await listCooperators(grower)).toEqual([]);
    expect(await listSiteOptions(grower)).toEqual([]);
  });

  it("scopes a coordinator to the programs they run", async () => {
    const [outsider] = await db.insert(s.users).values({ email: `outsider-${Date.now()}@example.org`, name: "Other Coordinator", role: "coordinator" }).$returningId();
    const viewer = await getActiveViewer(outsider!.id, 0);
    expect(viewer?.role).toBe("coordinator");
    expect(await listTrialsForViewer(viewer!)).toEqual([]);
    expect(await listLateSites(viewer!)).toEqual([]);
  });

  it("shows a cooperator only their own sites and schedules", async () => {
    const grower = await demoViewer(db, DEMO_SITES[1].grower.email);
    const sites = await listMySites(grower);
    expect(sites.map((x) => x.name)).toEqual([DEMO_SITES[1].name]);
    const schedules = await listMySchedules(grower);
    expect(schedules.length).toBe(1);
    expect(schedules.every((x) => x.siteName === DEMO_SITES[1].name)).toBe(true);
  });

  it("flags the demo sites that skipped scheduled counts as late, and no others", async () => {
    const coordinator = await demoViewer(db, DEMO_STAFF[1].email);
    // The demo's current season starts 30 days before the day it was seeded; counting lateness from that day
    // keeps the check true when the run crosses midnight after seeding.
    const [winter] = await db.select({ startsOn: s.seasons.startsOn }).from(s.seasons).where(eq(s.seasons.name, "Winter 2026–27"));
    const late = await listLateSites(coordinator, addDays(winter!.startsOn!, 30));
    // The demo data leaves Cedar Hollow one count behind and Fernbrook School two; the sites on schedule
    // also note their emergence date once it is due.
    expect(late.map((x) => [x.siteName, x.late.map((i) => i.label)]).sort()).toEqual(
      [
        [DEMO_SITES[1].name, ["Seedlings emerged (count), day 10"]],
        [DEMO_SITES[4].name, ["Seedlings emerged (count), day 5", "Seedlings emerged (count), day 7"]],
      ].sort(),
    );
  });

  it("treats a deactivated account as signed out", async () => {
    const [u] = await db.insert(s.users).values({ email: `inactive-${Date.now()}@example.org`, name: "Gone", role: "coordinator", active: false }).$returningId();
    expect(await getActiveViewer(u!.id, 0)).toBeNull();
  });
});
