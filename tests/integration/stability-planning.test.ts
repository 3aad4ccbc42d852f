import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { AnalysisResult } from "@/lib/domain/analysis/types";
import { DEMO_STAFF } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

// Stability and planning against the real database: the planning route's program and crop rules, the
// stability CSV, and the PDF report carrying the stability table only when the coordinator chose it.

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET: getPlanning } = await import("@/app/api/trials/[trialId]/planning/route");
const { GET: getAnalysis } = await import("@/app/api/trials/[trialId]/analysis/route");
const { GET: getExport } = await import("@/app/api/trials/[trialId]/analysis/export/route");
const { buildSnapshot } = await import("@/server/publish/build");
const { readSiteInclusion } = await import("@/server/publish/publish");
const { toPublicSnapshot } = await import("@/lib/domain/publish/public-shape");
const { renderTrialReport } = await import("@/reports/trial-report/render");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const ids: Record<string, number> = {};
let yieldId: number;
let admin: Viewer;
let rosa: Viewer;
let owen: Viewer;
let grower: Viewer;

const planning = (trialId: number, query: string) => getPlanning(new Request(`http://t/api/trials/${trialId}/planning?${query}`), { params: Promise.resolve({ trialId: String(trialId) }) });

beforeAll(async () => {
  for (const code of ["TV26-LET", "TV26-SPN", "JF27-LET"]) {
    const [t] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, code));
    ids[code] = t!.id;
  }
  const traitRows = await db.select({ id: s.traits.id, code: s.traits.code }).from(s.traits);
  yieldId = traitRows.find((t) => t.code === "marketable_yield")!.id;
  admin = await demoViewer(db, DEMO_STAFF[0].email);
  rosa = await demoViewer(db, DEMO_STAFF[1].email);
  owen = await demoViewer(db, "owen.marsh@juniper-flats.example");
  grower = await demoViewer(db, "tomas@willowbend.example");
});

afterAll(async () => {
  auth.viewer = null;
  await pool.end();
  await appPool.end();
});

describe("planning a trial from a past trial's CV", () => {
  it("gives staff the CV and mean a past trial of the same crop reached, from its analysis", async () => {
    auth.viewer = admin;
    const res = await planning(ids["JF27-LET"]!, `from=${ids["TV26-LET"]}&trait=${yieldId}`);
    expect(res.status).toBe(200);
    const body = await res.json();
    const analysis = (await (await getAnalysis(new Request(`http://t/api/trials/${ids["TV26-LET"]}/analysis?trait=${yieldId}`), { params: Promise.resolve({ trialId: String(ids["TV26-LET"]) }) })).json()) as AnalysisResult;
    expect(body.cv).toBeCloseTo(analysis.combined!.cv!, 10);
    expect(body.mean).toBeCloseTo(analysis.combined!.grandMean, 10);
    expect(body.trait).toMatchObject({ name: "Marketable yield", differenceUnit: "g per plot" });
    expect(body.from).toMatch(/pooled plot error over its \d analysed sites/);
  });

  it("a coordinator cannot read another program's trial's CV through planning", async () => {
    auth.viewer = owen;
    const res = await planning(ids["JF27-LET"]!, `from=${ids["TV26-LET"]}&trait=${yieldId}`);
    expect(res.status).toBe(404);
    expect((await res.json()).error).toBe("That past trial is not one of your trials of this crop.");
  });

  it("a coordinator cannot plan another program's trial", async () => {
    auth.viewer = rosa;
    const res = await planning(ids["JF27-LET"]!, `from=${ids["TV26-LET"]}&trait=${yieldId}`);
    expect(res.status).toBe(404);
  });

  it("a past trial of another crop is refused like a missing one", async () => {
    auth.viewer = admin;
    expect((await planning(ids["JF27-LET"]!, `from=${ids["TV26-SPN"]}&trait=${yieldId}`)).status).toBe(404);
  });

  it("a grower cannot use the planning route", async () => {
    auth.viewer = grower;
    expect((await planning(ids["TV26-LET"]!, `from=${ids["TV26-LET"]}&trait=${yieldId}`)).status).toBe(403);
  });

  it("a query that is not two ids is answered with a plain message", async () => {
    auth.viewer = admin;
    const res = await planning(ids["JF27-LET"]!, "from=abc&trait=1");
    expect(res.status).toBe(400);
    expect((await res.json()).error).toBe("Choose a past trial and one of its traits from the lists.");
  });
});

describe("stability in downloads and the PDF report", () => {
  it("the stability CSV carries each variety's slope, deviation MS and Shukla's variance as on the page", async () => {
    auth.viewer = rosa;
    const ctx = { params: Promise.resolve({ trialId: String(ids["TV26-LET"]) }) };
    const json = (await (await getAnalysis(new Request(`http://t/api/trials/${ids["TV26-LET"]}/analysis?trait=${yieldId}`), ctx)).json()) as AnalysisResult;
    const res = await getExport(new Request(`http://t/api/trials/${ids["TV26-LET"]}/analysis/export?trait=${yieldId}&format=csv&table=stability`), ctx);
    expect(res.status).toBe(200);
    const lines = (await res.text()).trim().split(/\r?\n/);
    expect(lines[0]).toMatch(/^"?Entry code"?,"?Variety"?,"?Check"?,"?Mean of site means"?,"?Slope on site mean"?/);
    expect(lines).toHaveLength(1 + json.combined!.stability!.rows.length);
    for (const row of json.combined!.stability!.rows) {
      const line = lines.find((l) => l.startsWith(row.blindCode) || l.startsWith(`"${row.blindCode}"`))!;
      expect(Number(line.split(",")[4])).toBeCloseTo(row.slope, 9);
    }
  });

  it("the PDF report has the stability table when the coordinator chose it, and not otherwise", async () => {
    const inclusion = (await readSiteInclusion(rosa, ids["TV26-LET"]!))!;
    const texts: string[] = [];
    for (const stabilityInReport of [true, false]) {
      const snapshot = await buildSnapshot(rosa, { trialId: ids["TV26-LET"]!, traitId: yieldId, settings: { siteModel: "random", separation: "lsd", stabilityInReport }, version: 99, changeNote: null, publishedAt: new Date(), siteInclusion: inclusion });
      const file = path.join(await fs.mkdtemp(path.join(os.tmpdir(), "stability-")), "report.pdf");
      await fs.writeFile(file, await renderTrialReport(toPublicSnapshot(snapshot)));
      texts.push(execFileSync("pdftotext", ["-layout", file, "-"]).toString());
    }
    expect(texts[0]).toMatch(/Stability across \d sites/);
    expect(texts[0]).toMatch(/Slope ± SE/);
    expect(texts[0]).toMatch(/Responds|Holds steadier|Swings/);
    expect(texts[1]).not.toMatch(/Stability across/);
  });
});
