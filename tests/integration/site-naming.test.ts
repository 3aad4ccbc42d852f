// A site whose grower did not agree to be named is "Site N, region" in every public output, and no public
// address leads from its anonymous results to the named site. The demo publishes the spring spinach trial
// with Maple Run Community Garden unnamed (the second site to join it).
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import * as s from "@/db/schema";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { getPublicReport, getPublicSite } = await import("@/server/publish/public-snapshots");
const { setSiteNaming } = await import("@/server/trials/enrolment");
const { GET: apiTrial } = await import("@/app/api/public/v1/trials/[code]/route");
const { GET: apiResults } = await import("@/app/api/public/v1/trials/[code]/results/route");
const { GET: apiPlots } = await import("@/app/api/public/v1/trials/[code]/plots/route");
const { GET: download } = await import("@/app/(public)/results/[code]/data/route");
const { GET: report } = await import("@/app/(public)/results/[code]/report/route");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const CODE = "TV26-SPN";
const UNNAMED = DEMO_SITES[3];
const ALIAS = `Site 2, ${UNNAMED.region}`;
type Handler = (request: Request, context: { params: Promise<{ code: string }> }) => Promise<Response>;
const call = (handler: Handler, url: string) => handler(new Request(`http://t${url}`), { params: Promise.resolve({ code: CODE }) });

let siteId: number;
let trialId: number;

beforeAll(async () => {
  const [site] = await db.select({ id: s.sites.id }).from(s.sites).where(eq(s.sites.name, UNNAMED.name));
  siteId = site!.id;
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, CODE));
  trialId = trial!.id;
});
afterAll(async () => {
  await db.update(s.enrolments).set({ namedInResults: false }).where(and(eq(s.enrolments.trialId, trialId), eq(s.enrolments.siteId, siteId)));
  await pool.end();
  await appPool.end();
});

describe("a site published without its name", () => {
  it("appears as 'Site N, region' in the public shape and the open data API, and its real name nowhere", async () => {
    const published = await getPublicReport(CODE);
    if (published?.kind !== "published") throw new Error("the demo ships the spinach trial published");
    const shape = JSON.stringify(published.snapshot);
    expect(shape).toContain(ALIAS);
    expect(shape).not.toContain(UNNAMED.name);
    expect(shape).not.toContain(UNNAMED.grower.name);
    expect(published.snapshot.sites.find((x) => x.name === ALIAS)).toMatchObject({ id: null, publicDescription: null });
    for (const [handler, url] of [
      [apiTrial, `/api/public/v1/trials/${CODE}`],
      [apiResults, `/api/public/v1/trials/${CODE}/results`],
      [apiPlots, `/api/public/v1/trials/${CODE}/plots`],
    ] as [Handler, string][]) {
      const res = await call(handler, url);
      expect(res.status).toBe(200);
      const text = await res.text();
      expect(text).not.toContain(UNNAMED.name);
      expect(text).toContain(ALIAS);
    }
  });

  it("is not named in the CSV, the workbook or the PDF, and its public site page does not list the trial", async () => {
    const csv = await (await call(download, `/results/${CODE}/data?format=csv`)).text();
    expect(csv).toContain(ALIAS);
    expect(csv).not.toContain(UNNAMED.name);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await (await call(download, `/results/${CODE}/data?format=xlsx`)).arrayBuffer());
    const cells: string[] = [];
    book.eachSheet((sheet) => sheet.eachRow((row) => row.eachCell((cell) => cells.push(String(cell.value)))));
    expect(cells.join("\n")).not.toContain(UNNAMED.name);
    const res = await call(report, `/results/${CODE}/report`);
    const file = path.join(await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-naming-")), "report.pdf");
    await fs.writeFile(file, Buffer.from(await res.arrayBuffer()));
    const text = execFileSync("pdftotext", ["-layout", file, "-"]).toString();
    expect(text).toContain(ALIAS);
    expect(text).not.toContain(UNNAMED.name);
    expect((await getPublicSite(siteId))?.trials.map((t) => t.code) ?? []).not.toContain(CODE);
  });

  it("is recorded per enrolment by the trial's own staff only, and audited", async () => {
    const rosa = await demoViewer(db, DEMO_STAFF[1].email);
    const owen = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
    await expect(setSiteNaming(owen, { trialId, siteId, named: true })).rejects.toMatchObject({ code: "not_found" });
    await setSiteNaming(rosa, { trialId, siteId, named: true });
    const [row] = await db.select({ named: s.enrolments.namedInResults }).from(s.enrolments).where(and(eq(s.enrolments.trialId, trialId), eq(s.enrolments.siteId, siteId)));
    expect(row!.named).toBe(true);
    const [audit] = await db.select().from(s.auditLog).where(and(eq(s.auditLog.action, "site_naming"), eq(s.auditLog.trialId, trialId)));
    expect(audit!.newValue).toEqual({ named: true });
    // Versions already published keep the naming they were published with.
    const still = await getPublicReport(CODE);
    expect(JSON.stringify(still)).not.toContain(UNNAMED.name);
  });
});
