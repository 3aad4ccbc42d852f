import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import ExcelJS from "exceljs";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import { DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";

// The REML mixed model is for the program's staff: on a trial's analysis when asked for, and across
// every season of a crop. A grower never receives it (their view is their own shared sites, blind until
// publication), and the across-seasons view reads only the viewer's programs' trials.

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET } = await import("@/app/api/trials/[trialId]/analysis/route");
const { GET: getExport } = await import("@/app/api/trials/[trialId]/analysis/export/route");
const { updateResultsShared } = await import("@/db/mutations/exclusions");
const { loadAcrossSeasons, varietyAcrossSeasons } = await import("@/server/analysis/across-seasons");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const LETTUCE = DEMO_TRIALS.find((t) => t.code === "TV26-LET")!;
let coordinator: Viewer;
let grower: Viewer;
let site: Awaited<ReturnType<typeof demoSite>>;
let yieldId: number;

async function analysisAs(viewer: Viewer, query: string): Promise<{ status: number; body: Record<string, unknown> }> {
  auth.viewer = viewer;
  const res = await GET(new Request(`http://test.local/api/trials/${site.trialId}/analysis?${query}`), { params: Promise.resolve({ trialId: String(site.trialId) }) });
  return { status: res.status, body: (await res.json()) as Record<string, unknown> };
}

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  grower = await demoViewer(db, DEMO_SITES[0].grower.email);
  site = await demoSite(db, LETTUCE.code, DEMO_SITES[0].name);
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  yieldId = trait!.id;
  auth.viewer = coordinator;
  await updateResultsShared(coordinator, { trialId: site.trialId, siteId: site.siteId, shared: true });
});

afterAll(async () => {
  await updateResultsShared(coordinator, { trialId: site.trialId, siteId: site.siteId, shared: false });
  await pool.end();
  await appPool.end();
});

describe("mixed model on a trial's analysis", () => {
  it("a coordinator asking for the mixed model gets variance components, means with SE and df, and every pair", async () => {
    const { status, body } = await analysisAs(coordinator, `trait=${yieldId}&mixed=1&unaccepted=1`);
    expect(status).toBe(200);
    const mixed = body.mixed as { components: { term: string; words: string }[]; means: { se: number; df: number }[]; pairs: unknown[]; environmentWord: string } | null;
    expect(mixed, String(body.mixedProblem)).not.toBeNull();
    expect(mixed!.environmentWord).toBe("site");
    expect(mixed!.components.map((c) => c.term).sort()).toEqual(["block:environment", "entry:environment", "environment", "residual"]);
    expect(mixed!.means.length).toBe(LETTUCE.entries.length);
    expect(mixed!.means.every((m) => m.se > 0 && m.df > 0)).toBe(true);
    expect(mixed!.pairs).toHaveLength((LETTUCE.entries.length * (LETTUCE.entries.length - 1)) / 2);
  });

  it("without asking, the analysis carries no mixed model (the least-squares page stays as fast as before)", async () => {
    const { body } = await analysisAs(coordinator, `trait=${yieldId}&unaccepted=1`);
    expect("mixed" in body).toBe(false);
  });

  it("a grower asking for the mixed model of a trial gets none, before or after publication", async () => {
    const { status, body } = await analysisAs(grower, `trait=${yieldId}&mixed=1&unaccepted=1`);
    expect(status).toBe(200);
    expect("mixed" in body).toBe(false);
    expect("mixedProblem" in body).toBe(false);
    // once published a grower gets the keyed payload of their own sites: still no mixed model
    const [before] = await db.select({ status: s.trials.status }).from(s.trials).where(eq(s.trials.id, site.trialId));
    await db.update(s.trials).set({ status: "published" }).where(eq(s.trials.id, site.trialId));
    try {
      const published = await analysisAs(grower, `trait=${yieldId}&mixed=1&unaccepted=1`);
      expect(published.status).toBe(200);
      expect("blind" in published.body).toBe(false);
      expect("mixed" in published.body).toBe(false);
    } finally {
      await db.update(s.trials).set({ status: before!.status }).where(eq(s.trials.id, site.trialId));
    }
  });
});

describe("mixed model in the exports", () => {
  const exportAs = async (query: string) => {
    auth.viewer = coordinator;
    return getExport(new Request(`http://test.local/api/trials/${site.trialId}/analysis/export?${query}`), { params: Promise.resolve({ trialId: String(site.trialId) }) });
  };

  it("the .xlsx carries the mixed-model sheets, matching the page's numbers, when the mixed model is chosen", async () => {
    const page = await analysisAs(coordinator, `trait=${yieldId}&mixed=1`);
    const mixed = page.body.mixed as { means: { blindCode: string; mean: number; se: number; df: number }[] };
    const res = await exportAs(`trait=${yieldId}&mixed=1&format=xlsx`);
    expect(res.status).toBe(200);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(await res.arrayBuffer());
    const names = workbook.worksheets.map((w) => w.name);
    expect(names).toEqual(expect.arrayContaining(["Mixed model", "Mixed means", "Mixed pairs"]));
    const sheet = workbook.getWorksheet("Mixed means")!;
    const header = (sheet.getRow(1).values as unknown[]).slice(1);
    const col = (name: string) => header.indexOf(name) + 1;
    let rows = 0;
    sheet.eachRow((row, n) => {
      if (n === 1) return;
      rows++;
      const m = mixed.means.find((x) => x.blindCode === row.getCell(col("Entry")).value)!;
      expect(row.getCell(col("Mean")).value).toBeCloseTo(m.mean, 9);
      expect(row.getCell(col("SE")).value).toBeCloseTo(m.se, 9);
      expect(row.getCell(col("df")).value).toBeCloseTo(m.df, 9);
    });
    expect(rows).toBe(mixed.means.length);
  });

  it("a CSV of the mixed pairs comes only when the mixed model is chosen", async () => {
    const res = await exportAs(`trait=${yieldId}&mixed=1&format=csv&table=mixed-pairs`);
    expect(res.status).toBe(200);
    const text = await res.text();
    expect(text.split("\n")[0]).toMatch(/First,Second/);
    const without = await exportAs(`trait=${yieldId}&format=csv&table=mixed-pairs`);
    expect(without.status).toBe(404);
    const plain = await exportAs(`trait=${yieldId}&format=xlsx`);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(await plain.arrayBuffer());
    expect(workbook.worksheets.map((w) => w.name)).not.toContain("Mixed means");
  });
});

describe("across seasons", () => {
  it("is for staff only: a grower gets nothing", async () => {
    expect(await loadAcrossSeasons(grower, {})).toBeNull();
  });

  it("lists only the viewer's programs' crops and analyses a crop's trait over site-years", async () => {
    const [crop] = await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Lettuce"));
    const view = (await loadAcrossSeasons(coordinator, { cropId: crop!.id, traitCode: "marketable_yield" }))!;
    expect(view.crops.map((c) => c.name)).toContain("Lettuce");
    expect(view.trait?.code).toBe("marketable_yield");
    expect(view.trials.some((t) => t.code === LETTUCE.code && t.used)).toBe(true);
    const mixed = view.outcome?.mixed;
    expect(mixed, view.outcome?.mixedProblem ?? "").toBeTruthy();
    expect(mixed!.environmentWord).toBe("site-year");
    expect(mixed!.environments.every((e) => /\d{4}/.test(e))).toBe(true);
  });

  it("a variety's standing across seasons is for staff: the coordinator gets mean, SE and site-years, a grower nothing", async () => {
    const [crop] = await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Lettuce"));
    const [variety] = await db.select({ id: s.varieties.id }).from(s.varieties).where(eq(s.varieties.name, LETTUCE.entries[0]!.variety));
    const args = { varietyId: variety!.id, cropId: crop!.id, traitCodes: ["marketable_yield"] };
    const rows = await varietyAcrossSeasons(coordinator, args);
    expect(rows).toHaveLength(1);
    expect(rows[0]!.standing.se).toBeGreaterThan(0);
    expect(rows[0]!.standing.environments).toBeGreaterThan(0);
    expect(await varietyAcrossSeasons(grower, args)).toEqual([]);
  });

  it("a coordinator of another program sees none of this program's crops or trials", async () => {
    const [program] = await db.insert(s.programs).values({ name: "Elsewhere extension", slug: `elsewhere-${Date.now()}` }).$returningId();
    const [user] = await db.insert(s.users).values({ email: `other-${Date.now()}@elsewhere.example`, name: "Other Coordinator", role: "coordinator" }).$returningId();
    await db.insert(s.programCoordinators).values({ programId: program!.id, userId: user!.id });
    const other: Viewer = { ...coordinator, id: user!.id, email: "other@elsewhere.example" };
    const [crop] = await db.select({ id: s.crops.id }).from(s.crops).where(eq(s.crops.name, "Lettuce"));
    const view = (await loadAcrossSeasons(other, { cropId: crop!.id, traitCode: "marketable_yield" }))!;
    expect(view.crops).toEqual([]);
    expect(view.crop).toBeNull();
    expect(view.outcome).toBeNull();
  });
});
