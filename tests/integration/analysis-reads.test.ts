import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Viewer } from "@/lib/domain/viewer";
import type { AnalysisPayload } from "@/lib/domain/analysis/types";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import { statementsDuring } from "../helpers/statements";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";

// One analysis request checks the viewer's access to the trial once and reads the trial's traits once,
// then reads the data within that check: the computed answer, the cached one and the 304 alike.
vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET } = await import("@/app/api/trials/[trialId]/analysis/route");
const { updateResultsShared } = await import("@/db/mutations/exclusions");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let coordinator: Viewer;
let grower: Viewer;
let lettuceId: number;
let yieldId: number;
let growerSiteId: number;

/** The SQL the app's pool is sent while `run` runs. */
const sqlDuring = async (run: () => Promise<unknown>) => (await statementsDuring(appPool, run)).map((statement) => statement.sql);

// The access check reads the trial with its crop (staff) or the viewer's shared enrolments (a grower); the
// traits are the trial's rows of trial_traits.
const isStaffAccessCheck = (sql: string) => /from `trials` inner join `crops`/i.test(sql) && /`trials`\.`program_id` in/i.test(sql);
const isSharedSitesCheck = (sql: string) => /from `enrolments`/i.test(sql) && /`enrolments`\.`results_shared` = \?/i.test(sql);
const isTraitsRead = (sql: string) => /from `trial_traits` inner join `traits`/i.test(sql);

async function analysis(query: string, headers: Record<string, string> = {}) {
  let res: Response | null = null;
  const sent = await sqlDuring(async () => {
    res = await GET(new Request(`http://test.local/api/trials/${lettuceId}/analysis?${query}`, { headers }), { params: Promise.resolve({ trialId: String(lettuceId) }) });
  });
  return { res: res! as Response, sent };
}

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  grower = await demoViewer(db, DEMO_SITES[0].grower.email);
  const site = await demoSite(db, "TV26-LET", DEMO_SITES[0].name);
  lettuceId = site.trialId;
  yieldId = site.traitId.marketable_yield!;
  growerSiteId = site.siteId;
});

afterAll(async () => {
  auth.viewer = null;
  await appPool.end();
  await pool.end();
});

describe("the reads of one analysis request", () => {
  it("a computed analysis checks the coordinator's access once and reads the traits once", async () => {
    auth.viewer = coordinator;
    // a setting no other request of this file asks for, so the analysis is computed here
    const { res, sent } = await analysis(`trait=${yieldId}&compare=tukey`);
    expect(res.status).toBe(200);
    expect(((await res.json()) as AnalysisPayload).perSite.length).toBeGreaterThan(1);
    expect(sent.filter(isStaffAccessCheck)).toHaveLength(1);
    expect(sent.filter(isTraitsRead)).toHaveLength(1);
  });

  it("the default trait is chosen within the same single access check", async () => {
    auth.viewer = coordinator;
    const { res, sent } = await analysis("model=fixed");
    expect(res.status).toBe(200);
    expect(sent.filter(isStaffAccessCheck)).toHaveLength(1);
    expect(sent.filter(isTraitsRead)).toHaveLength(1);
  });

  it("a cached answer and a 304 check access once too", async () => {
    auth.viewer = coordinator;
    const first = await analysis(`trait=${yieldId}`);
    expect(first.res.status).toBe(200);
    const cached = await analysis(`trait=${yieldId}`);
    expect(cached.res.status).toBe(200);
    expect(cached.sent.filter(isStaffAccessCheck)).toHaveLength(1);
    const notModified = await analysis(`trait=${yieldId}`, { "if-none-match": cached.res.headers.get("etag")! });
    expect(notModified.res.status).toBe(304);
    expect(notModified.sent.filter(isStaffAccessCheck)).toHaveLength(1);
    expect(notModified.sent.filter(isTraitsRead)).toHaveLength(1);
  });

  it("a grower's computed analysis of their shared site looks up their shared sites once", async () => {
    await updateResultsShared(coordinator, { trialId: lettuceId, siteId: growerSiteId, shared: true });
    try {
      auth.viewer = grower;
      const { res, sent } = await analysis(`trait=${yieldId}&compare=tukey&model=fixed`);
      expect(res.status).toBe(200);
      const body = (await res.json()) as AnalysisPayload;
      expect(body.perSite.map((p) => p.siteId)).toEqual([growerSiteId]);
      expect(sent.filter(isSharedSitesCheck)).toHaveLength(1);
      expect(sent.filter(isTraitsRead)).toHaveLength(1);
    } finally {
      auth.viewer = coordinator;
      await updateResultsShared(coordinator, { trialId: lettuceId, siteId: growerSiteId, shared: false });
    }
  });

  it("a coordinator of another program still gets the same not-found answer, with no data read", async () => {
    auth.viewer = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
    try {
      const { res, sent } = await analysis(`trait=${yieldId}`);
      expect(res.status).toBe(404);
      expect(sent.some((sql) => /from `observations`/i.test(sql))).toBe(false);
    } finally {
      auth.viewer = coordinator;
    }
  });
});
