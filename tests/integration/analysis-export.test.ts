import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { AnalysisResult } from "@/lib/domain/analysis/types";
import { testDatabase } from "../helpers/db";
import { DEMO_STAFF } from "@/db/demo-data";

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");

const { GET: getAnalysis } = await import("@/app/api/trials/[trialId]/analysis/route");
const { GET: getExport } = await import("@/app/api/trials/[trialId]/analysis/export/route");
const { insertExclusion, deleteExclusion } = await import("@/db/mutations/exclusions");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let lettuceId: number;
let yieldId: number;

const ctx = () => ({ params: Promise.resolve({ trialId: String(lettuceId) }) });

beforeAll(async () => {
  const [u] = await db.select({ id: s.users.id, email: s.users.email, name: s.users.name, role: s.users.role }).from(s.users).where(eq(s.users.email, DEMO_STAFF[1].email));
  auth.viewer = u!;
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  lettuceId = trial!.id;
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  yieldId = trait!.id;
});

afterAll(async () => {
  await pool.end();
  await appPool.end();
});

describe("analysis exports", () => {
  it("writes an .xlsx whose means, ANOVA and settings match the page's JSON, with formula-like text neutralised", async () => {
    const exclusionId = await insertExclusion(auth.viewer!, { trialId: lettuceId, siteId: null, plotId: null, traitId: null, category: "other", note: "placeholder" }).catch(() => null);
    expect(exclusionId).toBeNull(); // neither a site nor a plot: refused
    const [plot] = await db.select({ id: s.plots.id }).from(s.plots).where(eq(s.plots.trialId, lettuceId)).limit(1);
    const id = await insertExclusion(auth.viewer!, { trialId: lettuceId, siteId: null, plotId: plot!.id, traitId: yieldId, category: "other", note: '=HYPERLINK("http://example.test","x")' });
    try {
      const json = (await (await getAnalysis(new Request(`http://t/api/trials/${lettuceId}/analysis?trait=${yieldId}&plots=1`), ctx())).json()) as AnalysisResult;
      const res = await getExport(new Request(`http://t/api/trials/${lettuceId}/analysis/export?trait=${yieldId}&format=xlsx`), ctx());
      expect(res.status).toBe(200);
      expect(res.headers.get("content-disposition")).toMatch(/tv26-let-marketable-yield-analysis\.xlsx/);
      const workbook = new ExcelJS.Workbook();
      await workbook.xlsx.load(await res.arrayBuffer());
      expect(workbook.worksheets.map((w) => w.name)).toEqual(["Settings", "Raw data", "Means", "ANOVA", "Emergence", "Stability", "GGE biplot", "Missing plots", "Notes", "Data dictionary"]);

      const means = workbook.getWorksheet("Means")!;
      const header = (means.getRow(1).values as unknown[]).slice(1);
      const col = (name: string) => header.indexOf(name) + 1;
      let combinedRows = 0;
      means.eachRow((row, n) => {
        if (n === 1 || row.getCell(col("Scope")).value !== "All sites") return;
        combinedRows++;
        const m = json.combined!.means.find((x) => x.blindCode === row.getCell(col("Entry code")).value)!;
        expect(row.getCell(col("Mean")).value as number).toBeCloseTo(m.mean, 9);
        expect(row.getCell(col("LS mean")).value as number).toBeCloseTo(m.lsMean!, 9);
        expect(row.getCell(col("SE")).value as number).toBeCloseTo(m.se, 9);
        expect(row.getCell(col("Variety")).value).toBe(m.varietyName);
        expect(row.getCell(col("LSD 0.05")).value as number).toBeCloseTo(json.combined!.lsd!, 9);
      });
      expect(combinedRows).toBe(6);

      const anova = workbook.getWorksheet("ANOVA")!;
      let entryF: number | null = null;
      anova.eachRow((row) => {
        if (row.getCell(1).value === "All sites" && row.getCell(2).value === "Variety") entryF = row.getCell(6).value as number;
      });
      expect(entryF).toBeCloseTo(json.combined!.entryF!, 9);

      const settings = workbook.getWorksheet("Settings")!;
      const texts: string[] = [];
      settings.eachRow((row) => texts.push(String(row.getCell(2).value)));
      // A file travels beyond the portal: it names the public reason, never the staff's note.
      expect(texts.some((t) => t.includes("HYPERLINK"))).toBe(false);
      expect(texts.some((t) => t.includes("other reason"))).toBe(true);
      expect(texts.every((v) => !/^[=+\-@]/.test(v))).toBe(true);
      const raw = workbook.getWorksheet("Raw data")!;
      expect(raw.rowCount - 1).toBe(json.plots.length);

      const csv = await getExport(new Request(`http://t/api/trials/${lettuceId}/analysis/export?trait=${yieldId}&format=csv&table=means`), ctx());
      const text = await csv.text();
      expect(text.split("\r\n")[0]).toBe("Scope,Entry code,Variety,Check,Mean,LS mean,SE,Plots,Group,Rank,% of check,Difference from check,Beyond LSD,LSD 0.05,CV %");
      const first = json.combined!.means[0]!;
      expect(text).toContain(`All sites,${first.blindCode},${first.varietyName},${first.isCheck},${first.mean},`);
    } finally {
      await deleteExclusion(auth.viewer!, { trialId: lettuceId, exclusionId: id });
    }
  });

  it("writes an exclusion's public reason to the workbook and never its private note", async () => {
    const [site] = await db.select({ id: s.enrolments.siteId }).from(s.enrolments).where(eq(s.enrolments.trialId, lettuceId)).limit(1);
    const id = await insertExclusion(auth.viewer!, { trialId: lettuceId, siteId: site!.id, plotId: null, traitId: yieldId, category: "other", note: "@SUM(A1:A9) test" });
    try {
      const res = await getExport(new Request(`http://t/api/trials/${lettuceId}/analysis/export?trait=${yieldId}`), ctx());
      const workbook = new ExcelJS.Workbook();
      await workbook.xlsx.load(await res.arrayBuffer());
      const values: string[] = [];
      workbook.getWorksheet("Settings")!.eachRow((row) => values.push(String(row.getCell(2).value)));
      expect(values.some((v) => v.includes("@SUM(A1:A9) test"))).toBe(false);
      expect(values.some((v) => v.includes(`whole site`) && v.includes("other reason"))).toBe(true);
      expect(values.every((v) => !/^[=+\-@]/.test(v))).toBe(true);
    } finally {
      await deleteExclusion(auth.viewer!, { trialId: lettuceId, exclusionId: id });
    }
  });

  it("refuses cooperators and bad formats in plain words", async () => {
    const saved = auth.viewer;
    try {
      const bad = await getExport(new Request(`http://t/api/trials/${lettuceId}/analysis/export?format=pdf`), ctx());
      expect(bad.status).toBe(400);
      expect((await bad.json()).error).toBe("Ask for format xlsx or csv.");
      auth.viewer = { id: 999999, email: "x@example.test", name: "X", role: "cooperator" };
      expect((await getExport(new Request(`http://t/api/trials/${lettuceId}/analysis/export`), ctx())).status).toBe(403);
    } finally {
      auth.viewer = saved;
    }
  });
});
