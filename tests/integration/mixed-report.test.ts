import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, desc, eq, gt, like } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { PublicSnapshot } from "@/lib/domain/publish/public-shape";
import { DEMO_STAFF } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { leftOutSiteIds } from "@/lib/domain/publish/site-inclusion";

// A version published with the mixed model carries it in the public snapshot (names, no internal ids)
// and in the PDF report; one published without it does not.

const { GET: publicReport } = await import("@/app/(public)/results/[code]/report/route");
const { publishResults, readSiteInclusion } = await import("@/server/publish/publish");
const { getPublicReport } = await import("@/server/publish/public-snapshots");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const CODE = "TV26-LET";
let coordinator: Viewer;
let trial: { id: number; status: (typeof s.trials.$inferSelect)["status"] };
let mailMark = 0;
const publishedIds: number[] = [];

async function publish(mixed: boolean): Promise<{ snapshot: PublicSnapshot; text: string }> {
  const before = await getPublicReport(CODE);
  const [yieldTrait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  const published = await publishResults(coordinator, {
    trialId: trial.id,
    traitId: yieldTrait!.id,
    settings: { siteModel: "random", separation: "lsd", ...(mixed ? { mixed: true } : {}) },
    changeNote: before?.kind === "published" ? "Mixed model check." : null,
    confirmedLeftOut: leftOutSiteIds((await readSiteInclusion(coordinator, trial.id))!),
  });
  publishedIds.push(published.id);
  const report = await getPublicReport(CODE);
  if (report?.kind !== "published") throw new Error("expected the trial published");
  const res = await publicReport(new Request(`http://t/results/${CODE}/report`), { params: Promise.resolve({ code: CODE }) });
  expect(res.status).toBe(200);
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-mixed-report-"));
  const file = path.join(dir, "report.pdf");
  await fs.writeFile(file, Buffer.from(await res.arrayBuffer()));
  // lines joined: a sentence may wrap anywhere in the PDF
  return { snapshot: report.snapshot, text: execFileSync("pdftotext", [file, "-"]).toString().replace(/\s+/g, " ") };
}

beforeAll(async () => {
  const [lastMail] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = lastMail?.id ?? 0;
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  const [t] = await db.select({ id: s.trials.id, status: s.trials.status }).from(s.trials).where(eq(s.trials.code, CODE));
  trial = t!;
});

afterAll(async () => {
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), like(s.mailOutbox.subject, "Results published:%")));
  for (const id of publishedIds) await db.delete(s.publishedReports).where(eq(s.publishedReports.id, id));
  await db.update(s.trials).set({ status: trial.status }).where(eq(s.trials.id, trial.id));
  await pool.end();
  await appPool.end();
});

describe("mixed model in the published report", () => {
  it("a version published with the mixed model carries its tables in the PDF and the public snapshot, without internal ids", async () => {
    const { snapshot, text } = await publish(true);
    const mixed = snapshot.results[0]!.result.mixed;
    expect(mixed).toBeTruthy();
    expect(mixed!.means.every((m) => m.varietyName)).toBe(true);
    expect(JSON.stringify(mixed)).not.toMatch(/"(key|varietyId|entryId)"/);
    expect(text).toContain("Mixed model (REML)");
    expect(text).toMatch(/How much varieties change rank between sites/);
    expect(text).toMatch(/Each trait is also analysed with a REML mixed model/);
    // published: the notes name varieties, as the least-squares notes do
    expect(text).toMatch(/best \(highest\) is Frostline Romaine/);
  }, 120_000);

  it("a version published without it has no mixed-model section", async () => {
    const { snapshot, text } = await publish(false);
    expect(snapshot.results[0]!.result.mixed ?? null).toBeNull();
    expect(text).not.toContain("Mixed model (REML)");
  }, 120_000);
});
