import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq, notInArray } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { AnalysisPayload } from "@/lib/domain/analysis/types";
import type { AnalysisPageView, SiteSection } from "@/lib/domain/analysis/page-view";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";

// The analysis page sends a slim first view and fetches each site's section when it is opened; the section's
// route must guard exactly like the page: the trial's program staff, or a grower for their own shared site.
vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET: analysisGet } = await import("@/app/api/trials/[trialId]/analysis/route");
const { GET: sectionGet } = await import("@/app/api/trials/[trialId]/analysis/sites/[siteId]/route");
const { updateResultsShared } = await import("@/db/mutations/exclusions");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let coordinator: Viewer;
let lettuceId: number;
let yieldId: number;
let ownSiteId: number;
let neighbourSiteId: number;
let otherTrialSiteId: number;


function section(siteId: number | string, query = `trait=${yieldId}`, trialId = lettuceId) {
  return sectionGet(new Request(`http://test.local/api/trials/${trialId}/analysis/sites/${siteId}?${query}`), {
    params: Promise.resolve({ trialId: String(trialId), siteId: String(siteId) }),
  });
}

async function fullAnalysis(query = `trait=${yieldId}`): Promise<AnalysisPayload> {
  const res = await analysisGet(new Request(`http://test.local/api/trials/${lettuceId}/analysis?${query}`), { params: Promise.resolve({ trialId: String(lettuceId) }) });
  expect(res.status).toBe(200);
  return (await res.json()) as AnalysisPayload;
}

async function siteIdByName(name: string) {
  const [site] = await db.select({ id: s.sites.id }).from(s.sites).where(eq(s.sites.name, name));
  return site!.id;
}

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  lettuceId = trial!.id;
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  yieldId = trait!.id;
  ownSiteId = await siteIdByName(DEMO_SITES[0].name);
  neighbourSiteId = await siteIdByName(DEMO_SITES[1].name);
  // a site of another trial that the lettuce trial does not have
  const lettuceSites = (await db.select({ siteId: s.enrolments.siteId }).from(s.enrolments).where(eq(s.enrolments.trialId, lettuceId))).map((r) => r.siteId);
  const [elsewhere] = await db.select({ siteId: s.enrolments.siteId }).from(s.enrolments).where(and(notInArray(s.enrolments.siteId, lettuceSites))).limit(1);
  otherTrialSiteId = elsewhere!.siteId;
  auth.viewer = coordinator;
});

afterAll(async () => {
  auth.viewer = null;
  await appPool.end();
  await pool.end();
});

describe("the analysis page's site sections", () => {
  it("the page's first view carries each site's summary line but not its tables, and no per-site germination rows", async () => {
    auth.viewer = coordinator;
    const full = await fullAnalysis();
    const res = await analysisGet(new Request(`http://test.local/api/trials/${lettuceId}/analysis?trait=${yieldId}&page=1`), { params: Promise.resolve({ trialId: String(lettuceId) }) });
    expect(res.status).toBe(200);
    const page = (await res.json()) as AnalysisPageView;
    expect(page.perSite.map((p) => p.siteId)).toEqual(full.perSite.map((p) => p.siteId));
    for (const site of page.perSite) {
      const whole = full.perSite.find((p) => p.siteId === site.siteId)!;
      expect(site.result).not.toHaveProperty("means");
      expect(site.result).not.toHaveProperty("rows");
      expect(site.result?.entryP).toBe(whole.result?.entryP);
      expect(site.result?.lsd).toBe(whole.result?.lsd);
    }
    // the charts' per-site figures come as grids with every cell of the full analysis
    const cells = page.combined!.cellMeans;
    expect(cells.values.filter((v) => v !== null)).toHaveLength(full.combined!.cellMeans.length);
    for (const c of full.combined!.cellMeans) expect(cells.values[cells.siteIds.indexOf(c.siteId) * cells.entryIds.length + cells.entryIds.indexOf(c.entryId)]).toBe(c.mean);
    expect(Array.isArray(page.germination?.bySite)).toBe(false);
    expect(res.headers.get("etag")).not.toBe((await analysisGet(new Request(`http://test.local/api/trials/${lettuceId}/analysis?trait=${yieldId}`), { params: Promise.resolve({ trialId: String(lettuceId) }) })).headers.get("etag"));
  });

  it("a coordinator opening a site reads that site's means, ANOVA and germination rows, the same as in the full analysis", async () => {
    auth.viewer = coordinator;
    const full = await fullAnalysis("trait=" + yieldId + "&compare=tukey");
    const res = await section(neighbourSiteId, `trait=${yieldId}&compare=tukey`);
    expect(res.status).toBe(200);
    const body = (await res.json()) as SiteSection;
    expect(body.site).toEqual(full.perSite.find((p) => p.siteId === neighbourSiteId));
    expect(body.site.result!.means.length).toBeGreaterThan(0);
    expect(body.germination).toEqual((full.germination?.bySite ?? []).filter((g) => g.siteId === neighbourSiteId));
  });

  it("refuses a cooperator: their site until its results are shared, and a neighbour's site even then", async () => {
    const grower = await demoViewer(db, DEMO_SITES[0].grower.email);
    auth.viewer = grower;
    expect((await section(ownSiteId)).status).toBe(404);
    await updateResultsShared(coordinator, { trialId: lettuceId, siteId: ownSiteId, shared: true });
    try {
      const own = await section(ownSiteId);
      expect(own.status).toBe(200);
      const text = await own.text();
      // blind codes only before publication
      expect(text).not.toContain("Copper Ruffle");
      expect(text).not.toContain("varietyName");
      const neighbour = await section(neighbourSiteId);
      expect(neighbour.status).toBe(404);
    } finally {
      auth.viewer = coordinator;
      await updateResultsShared(coordinator, { trialId: lettuceId, siteId: ownSiteId, shared: false });
    }
  });

  it("refuses a coordinator of another program as if the trial did not exist", async () => {
    auth.viewer = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
    const res = await section(neighbourSiteId);
    expect(res.status).toBe(404);
    expect(await res.text()).not.toContain("entryP");
    auth.viewer = coordinator;
  });

  it("answers another trial's site id as it answers a site that does not exist", async () => {
    auth.viewer = coordinator;
    const elsewhere = await section(otherTrialSiteId);
    const nowhere = await section(999_999_999);
    expect(elsewhere.status).toBe(404);
    expect(nowhere.status).toBe(404);
    expect(await elsewhere.json()).toEqual(await nowhere.json());
    // and a bad id or setting is refused before anything is read
    expect((await section("abc")).status).toBe(404);
    expect((await section(neighbourSiteId, `trait=${yieldId}&compare=best`)).status).toBe(400);
  });
});
