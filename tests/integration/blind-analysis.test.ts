import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { ViewerAnalysis } from "@/lib/domain/analysis/types";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import { DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";

// A grower whose site's results are shared reads the analysis of that site. Until the trial is published
// nothing in it may tell which blind code is which variety: not the check flag, label germination, seed
// lots or sources, the coordinator's entry order, or a coordinator's note that names a variety.

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET } = await import("@/app/api/trials/[trialId]/analysis/route");
const { insertExclusion, deleteExclusion, updateResultsShared } = await import("@/db/mutations/exclusions");
const { loadAnalysisInput, loadAnalysisView } = await import("@/server/analysis/load-analysis");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const LETTUCE = DEMO_TRIALS.find((t) => t.code === "TV26-LET")!;
const KEY_WORDS = [...LETTUCE.entries.map((e) => e.variety), ...new Set(LETTUCE.entries.map((e) => e.source))];
const KEY_FIELDS = ["isCheck", "labelPercent", "labelGermination", "labels", "seedLot", "varietyName", "varietyId", "withinTolerance"];
let coordinator: Viewer;
let grower: Viewer;
let site: Awaited<ReturnType<typeof demoSite>>;
let yieldId: number;

async function asGrower(query: string): Promise<{ status: number; text: string; body: ViewerAnalysis }> {
  auth.viewer = grower;
  try {
    const res = await GET(new Request(`http://test.local/api/trials/${site.trialId}/analysis?${query}`), { params: Promise.resolve({ trialId: String(site.trialId) }) });
    const text = await res.text();
    return { status: res.status, text, body: JSON.parse(text) as ViewerAnalysis };
  } finally {
    auth.viewer = coordinator;
  }
}

/** Every object key anywhere in a JSON value. */
function keysIn(value: unknown, into = new Set<string>()): Set<string> {
  if (Array.isArray(value)) value.forEach((v) => keysIn(v, into));
  else if (value && typeof value === "object") for (const [k, v] of Object.entries(value)) keysIn(v, into.add(k));
  return into;
}

function expectNothingThatDecodes(text: string) {
  for (const word of KEY_WORDS) expect(text, word).not.toContain(word);
  const keys = keysIn(JSON.parse(text));
  for (const field of KEY_FIELDS) expect(keys.has(field), field).toBe(false);
  expect(text).not.toMatch(/label comparison|check variety/i);
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

describe("the blind stays closed for growers until the key is revealed", () => {
  it("a grower's analysis JSON names no variety and marks no check, label germination, seed lot or coordinator's note before publication", async () => {
    const plot = site.plots[0]!;
    const exclusionId = await insertExclusion(coordinator, { trialId: site.trialId, siteId: null, plotId: plot.id, traitId: null, category: "plot_damaged", note: `${LETTUCE.entries[0]!.variety} plot trampled; the check beside it was fine` });
    try {
      for (const query of [`trait=${yieldId}`, `trait=${yieldId}&plots=1`]) {
        const { status, text, body } = await asGrower(query);
        expect(status).toBe(200);
        expectNothingThatDecodes(text);
        expect(text).not.toContain("trampled");
        expect("blind" in body && body.blind).toBe(true);
        // The germination section is there, without its comparison with the seed labels.
        expect(body.germination?.byEntry.length).toBe(LETTUCE.entries.length);
        // Entries come numbered and ordered by blind code, not in the coordinator's list order.
        const means = body.perSite[0]!.result!.means;
        const codes = means.map((m) => m.blindCode);
        expect(codes).toEqual([...codes].sort());
        expect(means.map((m) => m.entryId)).toEqual(codes.map((_, i) => i + 1));
        expect(body.exclusions.map((x) => x.plotCode)).toEqual([plot.plotCode]);
      }
    } finally {
      await deleteExclusion(coordinator, { trialId: site.trialId, exclusionId });
    }
  });

  it("the analysis input read for a grower before publication holds no name, check flag, label germination, seed lot or coordinator's reason", async () => {
    // The first of two locks: even before the blind view is made, the server never holds the key for a grower.
    const plot = site.plots[0]!;
    const exclusionId = await insertExclusion(coordinator, { trialId: site.trialId, siteId: null, plotId: plot.id, traitId: null, category: "plot_damaged", note: `${LETTUCE.entries[0]!.variety} plot trampled` });
    try {
      const input = await loadAnalysisInput(grower, { trialId: site.trialId, traitId: yieldId });
      expect(input!.entries.length).toBe(LETTUCE.entries.length);
      for (const e of input!.entries) expect(e).toMatchObject({ varietyName: null, varietyId: null, isCheck: false, labelGermination: null, seedLot: null });
      expect(input!.exclusions.map((x) => x.plotId)).toEqual([plot.id]);
      expect(JSON.stringify(input)).not.toContain("trampled");
      for (const word of KEY_WORDS) expect(JSON.stringify(input), word).not.toContain(word);
      // Staff read the same input with the key.
      const staff = await loadAnalysisInput(coordinator, { trialId: site.trialId, traitId: yieldId });
      expect(staff!.entries.map((e) => e.varietyName).sort()).toEqual(LETTUCE.entries.map((e) => e.variety).sort());
      expect(staff!.exclusions.map((x) => x.note)).toContain(`${LETTUCE.entries[0]!.variety} plot trampled`);
    } finally {
      await deleteExclusion(coordinator, { trialId: site.trialId, exclusionId });
    }
  });

  it("the analysis page gets the same blind view as the JSON", async () => {
    const loaded = await loadAnalysisView(grower, site.trialId, { trait: yieldId });
    expect(loaded).not.toBeNull();
    expectNothingThatDecodes(JSON.stringify(loaded!.view));
  });

  it("once the trial is published, the grower sees the names the public already sees", async () => {
    const [before] = await db.select({ status: s.trials.status }).from(s.trials).where(eq(s.trials.id, site.trialId));
    await db.update(s.trials).set({ status: "published" }).where(eq(s.trials.id, site.trialId));
    try {
      const { status, text, body } = await asGrower(`trait=${yieldId}`);
      expect(status).toBe(200);
      expect("blind" in body).toBe(false);
      for (const e of LETTUCE.entries) expect(text).toContain(e.variety);
      expect(keysIn(body).has("isCheck")).toBe(true);
    } finally {
      await db.update(s.trials).set({ status: before!.status }).where(eq(s.trials.id, site.trialId));
    }
  });
});
