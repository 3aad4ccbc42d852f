import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq, sql } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { anovaMultiSite, anovaRcbd, lsd, type MultiSitePlot } from "@/lib/domain/stats";
import type { AnalysisResult } from "@/lib/domain/analysis/types";
import { testDatabase, unique } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";

// The route handler's guard reads the session; tests set the viewer directly instead.
vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");

const { GET } = await import("@/app/api/trials/[trialId]/analysis/route");
const { insertExclusion, deleteExclusion } = await import("@/db/mutations/exclusions");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let coordinator: Viewer;
let lettuceId: number;
let yieldId: number;


async function call(query: string, headers: Record<string, string> = {}, trialId = lettuceId) {
  return GET(new Request(`http://test.local/api/trials/${trialId}/analysis?${query}`, { headers }), { params: Promise.resolve({ trialId: String(trialId) }) });
}

async function analysis(query: string): Promise<AnalysisResult> {
  const res = await call(query);
  expect(res.status).toBe(200);
  return (await res.json()) as AnalysisResult;
}

/** Lettuce yield rows read with plain SQL: accepted sites only (unless asked), null for a missing value. */
async function plainRows(includeUnaccepted = false) {
  const [rows] = (await db.execute(sql`
    SELECT p.site_id AS siteId, p.block AS block, p.entry_id AS entryId, o.value_number AS value, sub.status AS status
    FROM plots p
    JOIN enrolments e ON e.id = p.enrolment_id
    LEFT JOIN submissions sub ON sub.enrolment_id = e.id
    LEFT JOIN observations o ON o.plot_id = p.id AND o.trait_id = ${yieldId}
    WHERE p.trial_id = ${lettuceId}
    ORDER BY p.site_id, p.block, p.position`)) as unknown as [{ siteId: number; block: number; entryId: number; value: string | number | null; status: string | null }[]];
  return rows
    .filter((r) => includeUnaccepted || r.status === "accepted")
    .map((r) => ({ site: String(r.siteId), block: String(r.block), entry: String(r.entryId), value: r.value === null ? null : Number(r.value) }));
}

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  lettuceId = trial!.id;
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  yieldId = trait!.id;
  auth.viewer = coordinator;
});

afterAll(async () => {
  await pool.end();
  await appPool.end();
});

describe("analysis API numbers equal lib/domain/stats on rows read straight from the database", () => {
  it("matches per-site and combined F, CV, means and LSD for lettuce marketable yield", async () => {
    const result = await analysis(`trait=${yieldId}`);
    const data = await plainRows();
    const siteIds = [...new Set(data.map((d) => d.site))];
    expect(result.perSite.map((p) => String(p.siteId)).sort()).toEqual(siteIds.sort());
    for (const site of result.perSite) {
      const table = anovaRcbd(data.filter((d) => d.site === String(site.siteId)));
      const entryRow = table.rows.find((r) => r.source === "entry")!;
      expect(site.result!.entryF).toBeCloseTo(entryRow.f!, 8);
      expect(site.result!.cv).toBeCloseTo(table.cv, 8);
      for (const m of table.entryMeans) expect(site.result!.means.find((x) => String(x.entryId) === m.entry)!.mean).toBeCloseTo(m.mean, 8);
      const l = lsd(table, 0.05);
      if (l) expect(site.result!.lsd).toBeCloseTo(l.lsd, 8);
      else expect(site.result!.lsd).toBeNull();
    }
    const combined = anovaMultiSite(data as MultiSitePlot[], { sites: "random" });
    expect(result.combined!.entryF).toBeCloseTo(combined.rows.find((r) => r.source === "entry")!.f!, 8);
    expect(result.combined!.interactionF).toBeCloseTo(combined.rows.find((r) => r.source === "entry:site")!.f!, 8);
    expect(result.combined!.cv).toBeCloseTo(combined.cv, 8);
    for (const m of combined.lsMeans!) expect(result.combined!.means.find((x) => String(x.entryId) === m.entry)!.lsMean).toBeCloseTo(m.mean, 8);
    const l = lsd(combined, 0.05);
    if (l) expect(result.combined!.lsd).toBeCloseTo(l.lsd, 8);
    // Every plot without a value is listed with how it was handled.
    expect(result.missing.length).toBe(data.filter((d) => d.value === null).length);
    expect(result.notes[0]).toMatch(/^Varieties (differed|did not differ clearly) in marketable yield \(g per plot\) at (\d of 5 sites|all 5 sites|any of the 5 sites)/);
  });

  it("fixed sites test entries against the pooled error", async () => {
    const result = await analysis(`trait=${yieldId}&model=fixed&compare=tukey`);
    const combined = anovaMultiSite((await plainRows()) as MultiSitePlot[], { sites: "fixed" });
    expect(result.combined!.entryF).toBeCloseTo(combined.rows.find((r) => r.source === "entry")!.f!, 8);
    expect(result.combined!.means.every((m) => m.letter !== null)).toBe(true);
  });

  it("include-unaccepted brings the submitted site in, clearly marked", async () => {
    const accepted = await analysis(`trait=${yieldId}`);
    const all = await analysis(`trait=${yieldId}&unaccepted=1`);
    expect(accepted.perSite.length).toBe(5);
    expect(all.perSite.length).toBe(6);
    const extra = all.perSite.find((p) => p.status !== "accepted")!;
    expect(accepted.sites.find((x) => x.id === extra.siteId)!.why).toMatch(/not accepted yet/);
    expect(all.warnings.join(" ")).toMatch(/not yet accepted/);
    const combined = anovaMultiSite((await plainRows(true)) as MultiSitePlot[]);
    expect(all.combined!.entryF).toBeCloseTo(combined.rows.find((r) => r.source === "entry")!.f!, 8);
  });

  it("germination figures come from the seed counts with Wilson intervals, chi-square and CMH", async () => {
    const result = await analysis(`trait=${yieldId}`);
    const g = result.germination!;
    expect(g.byEntry).toHaveLength(6);
    for (const r of g.byEntry) {
      expect(r.lower).toBeLessThan(r.percent);
      expect(r.upper).toBeGreaterThan(r.percent);
    }
    expect(g.chiSquare!.df).toBe(5);
    expect(g.cmh!.sites).toBe(5);
    expect(g.labels.find((x) => x.labelPercent === null)!.note).toMatch(/not|no germination/i);
  });
});

describe("exclusions", () => {
  it("leave a site out, are listed, and change the results until removed", async () => {
    const before = await analysis(`trait=${yieldId}`);
    const site = before.perSite[0]!;
    const id = await insertExclusion(coordinator, { trialId: lettuceId, siteId: site.siteId, plotId: null, traitId: null, category: "plot_damaged", note: `Hail flattened the beds ${unique("x")}` });
    try {
      const after = await analysis(`trait=${yieldId}`);
      expect(after.perSite.map((p) => p.siteId)).not.toContain(site.siteId);
      expect(after.sites.find((x) => x.id === site.siteId)!.why).toBe("excluded: plot damaged (animals, hail, flooding)");
      expect(after.exclusions.map((x) => x.id)).toContain(id);
      expect(after.combined!.entryF).not.toBeCloseTo(before.combined!.entryF!, 6);
      const [audit] = await db.select({ action: s.auditLog.action }).from(s.auditLog).where(sql`${s.auditLog.entity} = 'analysis_exclusion' AND ${s.auditLog.entityId} = ${String(id)}`);
      expect(audit!.action).toBe("exclude");
    } finally {
      await deleteExclusion(coordinator, { trialId: lettuceId, exclusionId: id });
    }
    const restored = await analysis(`trait=${yieldId}`);
    expect(restored.combined!.entryF).toBeCloseTo(before.combined!.entryF!, 10);
  });

  it("leave a plot out and list it as excluded among the missing plots", async () => {
    const before = await analysis(`trait=${yieldId}&plots=1`);
    const plot = before.plots.find((p) => p.status === "used")!;
    const [row] = await db.select({ id: s.plots.id }).from(s.plots).where(sql`${s.plots.trialId} = ${lettuceId} AND ${s.plots.plotCode} = ${plot.plotCode}`);
    const id = await insertExclusion(coordinator, { trialId: lettuceId, siteId: null, plotId: row!.id, traitId: yieldId, category: "protocol_not_followed", note: "Irrigation line burst on this plot" });
    try {
      const after = await analysis(`trait=${yieldId}&plots=1`);
      expect(after.missing.find((m) => m.plotCode === plot.plotCode)!.reason).toBe("excluded: trial protocol not followed");
      expect(after.plots.find((p) => p.plotCode === plot.plotCode)!.status).toBe("excluded");
      const site = after.perSite.find((p) => p.siteId === plot.siteId)!;
      expect(site.result!.n).toBe(before.perSite.find((p) => p.siteId === plot.siteId)!.result!.n - 1);
    } finally {
      await deleteExclusion(coordinator, { trialId: lettuceId, exclusionId: id });
    }
  });
});

describe("exclusion form", () => {
  it("finds a plot by the code on its label, and refuses an unknown code with a field message and nothing written", async () => {
    const { exclusionSchema } = await import("@/lib/validation/analysis");
    const [plot] = await db.select({ id: s.plots.id, plotCode: s.plots.plotCode }).from(s.plots).where(eq(s.plots.trialId, lettuceId)).limit(1);
    const typed = exclusionSchema.parse({ trialId: String(lettuceId), target: "plot", plotCode: ` ${plot!.plotCode.toLowerCase()} `, traitId: "all", category: "plot_damaged", note: "Rabbits ate the whole plot" });
    expect(typed).toMatchObject({ plotId: null, siteId: null, plotCode: plot!.plotCode, traitId: null });
    const id = await insertExclusion(coordinator, typed);
    try {
      const [stored] = await db.select({ plotId: s.analysisExclusions.plotId }).from(s.analysisExclusions).where(eq(s.analysisExclusions.id, id));
      expect(stored!.plotId).toBe(plot!.id);
    } finally {
      await deleteExclusion(coordinator, { trialId: lettuceId, exclusionId: id });
    }

    const missingCode = exclusionSchema.safeParse({ trialId: String(lettuceId), target: "plot", plotCode: "", category: "plot_damaged" });
    expect(missingCode.success).toBe(false);
    expect(missingCode.error!.issues[0]!.path).toEqual(["plotCode"]);

    const count = async () => (await db.select({ n: sql<number>`COUNT(*)` }).from(s.analysisExclusions))[0]!.n;
    const before = await count();
    const unknown = exclusionSchema.parse({ trialId: String(lettuceId), target: "plot", plotCode: "NO-SUCH-9", category: "plot_damaged" });
    const error = await insertExclusion(coordinator, unknown).catch((e: unknown) => e);
    expect(error).toMatchObject({ code: "not_found", fieldErrors: { plotCode: [expect.stringMatching(/no plot NO-SUCH-9 in this trial/)] } });
    expect(await count()).toBe(before);
  });

  it("asks for the public reason from the list, and for a note when the reason is \"other\"", async () => {
    const { exclusionSchema } = await import("@/lib/validation/analysis");
    const base = { trialId: String(lettuceId), target: "plot", plotCode: "S1-B1-01", traitId: "all" };
    const free = exclusionSchema.safeParse({ ...base, category: "the neighbour's dog", note: "" });
    expect(free.error!.issues.map((i) => [i.path[0], i.message])).toEqual([["category", "Choose the reason the public will read."]]);
    const other = exclusionSchema.safeParse({ ...base, category: "other", note: "  " });
    expect(other.error!.issues.map((i) => i.path[0])).toEqual(["note"]);
    expect(exclusionSchema.parse({ ...base, category: "seed_mix_up", note: "" })).toMatchObject({ category: "seed_mix_up", note: null });
  });
});

describe("caching", () => {
  it("answers 304 to a matching If-None-Match and a new ETag after a data change", async () => {
    const first = await call(`trait=${yieldId}`);
    const etag = first.headers.get("etag")!;
    expect(etag).toMatch(/^W\/"/);
    const again = await call(`trait=${yieldId}`, { "If-None-Match": etag });
    expect(again.status).toBe(304);
    const other = await call(`trait=${yieldId}&compare=tukey`, { "If-None-Match": etag });
    expect(other.status).toBe(200);

    // A plot note is not read by the yield analysis, so editing one keeps the cached result.
    const [note] = await db
      .select({ id: s.observations.id, text: s.observations.valueText })
      .from(s.observations)
      .innerJoin(s.plots, eq(s.plots.id, s.observations.plotId))
      .innerJoin(s.traits, eq(s.traits.id, s.observations.traitId))
      .where(sql`${s.plots.trialId} = ${lettuceId} AND ${s.traits.code} = 'plot_notes'`)
      .limit(1);
    if (note) {
      await db.update(s.observations).set({ valueText: `${note.text} (checked)` }).where(eq(s.observations.id, note.id));
      try {
        expect((await call(`trait=${yieldId}`, { "If-None-Match": etag })).status).toBe(304);
      } finally {
        await db.update(s.observations).set({ valueText: note.text }).where(eq(s.observations.id, note.id));
      }
    }

    const [obs] = await db
      .select({ id: s.observations.id, value: s.observations.valueNumber })
      .from(s.observations)
      .innerJoin(s.plots, eq(s.plots.id, s.observations.plotId))
      .where(sql`${s.plots.trialId} = ${lettuceId} AND ${s.observations.traitId} = ${yieldId} AND ${s.observations.valueNumber} IS NOT NULL`)
      .limit(1);
    await db.update(s.observations).set({ valueNumber: obs!.value! + 7 }).where(eq(s.observations.id, obs!.id));
    try {
      const changed = await call(`trait=${yieldId}`, { "If-None-Match": etag });
      expect(changed.status).toBe(200);
      expect(changed.headers.get("etag")).not.toBe(etag);
    } finally {
      await db.update(s.observations).set({ valueNumber: obs!.value }).where(eq(s.observations.id, obs!.id));
    }
  });
});

describe("plot rows", () => {
  it("are left out of the JSON unless asked for, and come with their own ETag when they are", async () => {
    const plain = await call(`trait=${yieldId}`);
    const body = await plain.json();
    expect(body).not.toHaveProperty("plots");
    const withRows = await call(`trait=${yieldId}&plots=1`);
    expect(withRows.status).toBe(200);
    const full = (await withRows.json()) as AnalysisResult;
    // One row per plot of the accepted sites, and the values used are the stored values.
    const data = await plainRows();
    expect(full.plots).toHaveLength(data.length);
    const byValue = (a: number, b: number) => a - b;
    expect(full.plots.filter((p) => p.status === "used").map((p) => p.value!).sort(byValue)).toEqual(data.filter((d) => d.value !== null).map((d) => d.value!).sort(byValue));
    expect(full.plots.filter((p) => p.status === "missing")).toHaveLength(body.missing.length);
    // Apart from the rows, both answers are the same analysis.
    const { plots: _rows, ...rest } = full;
    expect(rest).toEqual(body);
    const etag = plain.headers.get("etag")!;
    expect(withRows.headers.get("etag")).not.toBe(etag);
    expect((await call(`trait=${yieldId}&plots=1`, { "If-None-Match": etag })).status).toBe(200);
    expect((await call(`trait=${yieldId}&plots=1`, { "If-None-Match": withRows.headers.get("etag")! })).status).toBe(304);
    const bad = await call(`trait=${yieldId}&plots=all`);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error).toBe("plots must be 1 or 0.");
  });
});

describe("who may read an analysis", () => {
  it("refuses signed-out visitors, cooperators whose site is not shared and coordinators of other programs", async () => {
    try {
      auth.viewer = null;
      expect((await call(`trait=${yieldId}`)).status).toBe(401);
      auth.viewer = await demoViewer(db, DEMO_SITES[0].grower.email);
      expect((await call(`trait=${yieldId}`)).status).toBe(404);
      const email = `${unique("other")}@example.test`;
      const [u] = await db.insert(s.users).values({ email, name: "Other Coordinator", role: "coordinator", passwordHash: "x" }).$returningId();
      const [program] = await db.insert(s.programs).values({ slug: unique("other"), name: unique("Other program") }).$returningId();
      await db.insert(s.programCoordinators).values({ programId: program!.id, userId: u!.id });
      auth.viewer = { id: u!.id, email, name: "Other Coordinator", role: "coordinator" };
      const res = await call(`trait=${yieldId}`);
      expect(res.status).toBe(404);
      expect(JSON.stringify(await res.json())).not.toContain("Copper Ruffle");
      await expect(insertExclusion(auth.viewer, { trialId: lettuceId, siteId: null, plotId: 1, traitId: null, category: "other", note: "not mine to exclude" })).rejects.toThrow(/not in your programs/);
    } finally {
      auth.viewer = coordinator;
    }
  });

  it("answers bad settings in plain words", async () => {
    const res = await call(`trait=${yieldId}&model=sometimes`);
    expect(res.status).toBe(400);
    expect((await res.json()).error).toBe("Sites must be random or fixed.");
    const wrongTrait = await call(`trait=999999`);
    expect(wrongTrait.status).toBe(400);
  });
});

describe("variety history", () => {
  it("shows staff of the program where a variety ranked, and nobody else", async () => {
    const { getVarietyHistory } = await import("@/db/queries/analysis");
    const { loadAnalysis } = await import("@/server/analysis/load-analysis");
    const { standingOf } = await import("@/lib/domain/analysis/history");
    const [variety] = await db.select({ id: s.varieties.id }).from(s.varieties).where(eq(s.varieties.name, "Copper Ruffle"));
    const history = await getVarietyHistory(coordinator, variety!.id);
    expect(history!.trials.map((t) => t.trialCode)).toContain("TV26-LET");
    const row = history!.trials.find((t) => t.trialCode === "TV26-LET")!;
    const loaded = await loadAnalysis(coordinator, row.trialId, { trait: yieldId });
    const standing = standingOf(loaded!.result, row.entryId);
    const combined = loaded!.result.combined!.means.find((m) => m.entryId === row.entryId)!;
    expect(standing.rank).toBe(combined.rank);
    expect(standing.of).toBe(6);
    expect(standing.sitesAnalysed).toBe(5);
    expect(standing.percentOfTrialMean).toBeCloseTo((100 * combined.lsMean!) / loaded!.result.combined!.grandMean, 9);
    expect(await getVarietyHistory(await demoViewer(db, DEMO_SITES[0].grower.email), variety!.id)).toBeNull();
  });
});

describe("sharing a site's results with its cooperators", () => {
  it("shows a cooperator their own shared site only, with blind codes, and hides it again when unshared", async () => {
    const { updateResultsShared } = await import("@/db/mutations/exclusions");
    const [own] = await db.select({ id: s.sites.id }).from(s.sites).where(eq(s.sites.name, DEMO_SITES[0].name));
    const grower = await demoViewer(db, DEMO_SITES[0].grower.email);
    const neighbour = await demoViewer(db, DEMO_SITES[1].grower.email);
    await updateResultsShared(coordinator, { trialId: lettuceId, siteId: own!.id, shared: true });
    try {
      const staffView = await analysis(`trait=${yieldId}`);
      expect(staffView.sites.find((x) => x.id === own!.id)!.shared).toBe(true);
      auth.viewer = grower;
      const res = await call(`trait=${yieldId}`);
      expect(res.status).toBe(200);
      const mine = (await res.json()) as AnalysisResult;
      expect(mine.sites.map((x) => x.id)).toEqual([own!.id]);
      expect(mine.perSite).toHaveLength(1);
      expect(mine.combined).toBeNull();
      expect(JSON.stringify(mine)).not.toContain("Copper Ruffle");
      expect(mine).not.toHaveProperty("plots");
      const rows = ((await (await call(`trait=${yieldId}&plots=1`)).json()) as AnalysisResult).plots;
      expect(rows.length).toBeGreaterThan(0);
      expect(rows.every((p) => p.siteId === own!.id)).toBe(true);
      // Same numbers as the staff view of that site.
      expect(mine.perSite[0]!.result!.entryF).toBeCloseTo(staffView.perSite.find((x) => x.siteId === own!.id)!.result!.entryF!, 10);
      expect(res.headers.get("etag")).not.toBe((await (async () => { auth.viewer = coordinator; return call(`trait=${yieldId}`); })()).headers.get("etag"));
      auth.viewer = neighbour;
      expect((await call(`trait=${yieldId}`)).status).toBe(404);
      await expect(updateResultsShared(grower, { trialId: lettuceId, siteId: own!.id, shared: false })).rejects.toThrow();
    } finally {
      auth.viewer = coordinator;
      await updateResultsShared(coordinator, { trialId: lettuceId, siteId: own!.id, shared: false });
    }
    auth.viewer = grower;
    expect((await call(`trait=${yieldId}`)).status).toBe(404);
    auth.viewer = coordinator;
  });
});
