import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";

// The across-seasons downloads carry what the page shows, to whom the page shows it: staff, and only their
// programs' trials of the crop.

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET } = await import("@/app/api/trials/across-seasons/export/route");
const { loadAcrossSeasons } = await import("@/server/analysis/across-seasons");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let coordinator: Viewer;
let otherCoordinator: Viewer;
let admin: Viewer;
let grower: Viewer;
let lettuceId: number;

const download = (viewer: Viewer | null, query: string) => {
  auth.viewer = viewer;
  return GET(new Request(`http://test.local/api/trials/across-seasons/export?${query}`));
};
const lettuce = (extra: string) => `crop=${lettuceId}&trait=marketable_yield&${extra}`;

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  admin = await demoViewer(db, DEMO_STAFF[0].email);
  otherCoordinator = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
  grower = await demoViewer(db, DEMO_SITES[0].grower.email);
  const [crop] = await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Lettuce"));
  lettuceId = crop!.id;
});

afterAll(async () => {
  await pool.end();
  await appPool.end();
});

describe("across-seasons downloads", () => {
  it("an .xlsx of what the page shows: settings, the mixed model's variance, means and pairs with variety names, and the crop's trials", async () => {
    const view = (await loadAcrossSeasons(coordinator, { cropId: lettuceId, traitCode: "marketable_yield" }))!;
    const mixed = view.outcome!.mixed!;
    const res = await download(coordinator, lettuce("format=xlsx"));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/spreadsheetml/);
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="lettuce-marketable-yield-across-seasons\.xlsx"/);
    expect(res.headers.get("cache-control")).toMatch(/private, no-store/);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(await res.arrayBuffer());
    expect(workbook.worksheets.map((w) => w.name)).toEqual(["Across seasons", "Mixed model", "Mixed means", "Mixed pairs", "Trials"]);
    const rows = (name: string) => workbook.getWorksheet(name)!.getSheetValues().slice(1).map((r) => (r as unknown[]).slice(1));
    expect(rows("Across seasons")).toContainEqual(["Crop", "Lettuce"]);
    expect(rows("Across seasons")).toContainEqual(["Site-years", mixed.environments.join(", ")]);
    const means = rows("Mixed means");
    expect(means[0]!.slice(0, 5)).toEqual(["Entry", "Variety", "Check", "Mean", "SE"]);
    expect(means.slice(1).map((r) => [r[1], r[3], r[7]])).toEqual(mixed.means.map((m) => [m.varietyName, m.mean, m.environments]));
    expect(rows("Mixed pairs").length - 1).toBe(mixed.pairs.length);
    const trials = rows("Trials");
    expect(trials.slice(1).map((r) => [r[0], r[4]])).toEqual(view.trials.map((t) => [t.code, t.used]));
    expect(trials.map((r) => r[0])).not.toContain(DEMO_SECOND_PROGRAM.trial.code);
  });

  it("one table as CSV, the same figures as the workbook", async () => {
    const view = (await loadAcrossSeasons(coordinator, { cropId: lettuceId, traitCode: "marketable_yield" }))!;
    const res = await download(coordinator, lettuce("format=csv&table=means"));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(/lettuce-marketable-yield-across-seasons-means\.csv/);
    const [header, ...body] = parseCsv(await res.text()).filter((r) => r.some((c) => c !== ""));
    expect(header).toContain("site-years grown");
    expect(body.map((r) => [r[1], Number(r[3])])).toEqual(view.outcome!.mixed!.means.map((m) => [m.varietyName, m.mean]));
  });

  it("a coordinator gets only their programs' trials of the crop; another program's coordinator none of them", async () => {
    const own = await (await download(coordinator, lettuce("format=csv&table=trials"))).text();
    expect(own).toContain("TV26-LET");
    expect(own).not.toContain(DEMO_SECOND_PROGRAM.trial.code);
    const other = await download(otherCoordinator, lettuce("format=csv&table=trials"));
    expect(other.status).toBe(200);
    const otherText = await other.text();
    expect(otherText).toContain(DEMO_SECOND_PROGRAM.trial.code);
    expect(otherText).not.toContain("TV26-LET");
    // Their lettuce trial has no data yet: no means to download, said plainly, and nothing of the other program's.
    const means = await download(otherCoordinator, lettuce("format=csv&table=means"));
    expect(means.status).toBe(404);
    expect(JSON.stringify(await means.json())).not.toMatch(/TV26|Tamarack/);
    expect((await download(admin, lettuce("format=csv&table=trials"))).status).toBe(200);
  });

  it("a grower and the public are refused, and a crop outside the viewer's programs answers like a missing one", async () => {
    expect((await download(grower, lettuce("format=xlsx"))).status).toBe(403);
    expect((await download(null, lettuce("format=xlsx"))).status).toBe(401);
    const [kale] = await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Kale"));
    const foreign = await download(otherCoordinator, `crop=${kale!.id}&trait=marketable_yield&format=xlsx`);
    const missing = await download(otherCoordinator, `crop=999999999&trait=marketable_yield&format=xlsx`);
    expect([foreign.status, await foreign.json()]).toEqual([missing.status, await missing.json()]);
    expect(missing.status).toBe(404);
    expect((await download(coordinator, `crop=${lettuceId}&trait=no_such_trait&format=xlsx`)).status).toBe(404);
    expect((await download(coordinator, lettuce("format=pdf"))).status).toBe(400);
  });
});
