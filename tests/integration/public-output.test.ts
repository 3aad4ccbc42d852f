import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, desc, eq, gt, inArray, like } from "drizzle-orm";
import ExcelJS from "exceljs";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { DEMO_STAFF } from "@/db/demo-data";

// Everything the public can fetch of a published trial goes through one public shape. The lettuce demo
// has a site whose data were submitted but not accepted, and here one site shares its results with its
// grower: neither fact, nor any internal id, may reach a public output.

const { GET: publicJson } = await import("@/app/api/public/v1/trials/[code]/route");
const { GET: publicResults } = await import("@/app/api/public/v1/trials/[code]/results/route");
const { GET: publicPlots } = await import("@/app/api/public/v1/trials/[code]/plots/route");
const { GET: publicList } = await import("@/app/api/public/v1/trials/route");
const { GET: publicData } = await import("@/app/(public)/results/[code]/data/route");
const { GET: publicReport } = await import("@/app/(public)/results/[code]/report/route");
const { getPublicSite, getPublicVariety } = await import("@/server/publish/public-snapshots");
const { publishResults, readSiteInclusion } = await import("@/server/publish/publish");
const { leftOutSiteIds } = await import("@/lib/domain/publish/site-inclusion");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const CODE = "TV26-LET";
let coordinator: Viewer;
let trial: { id: number; status: (typeof s.trials.$inferSelect)["status"] };
let facts: { siteIds: number[]; varietyIds: number[]; statuses: string[]; sharedSite: number };

/** Every key with its path, anywhere in a JSON value. */
function entriesIn(value: unknown, at = "$", into: { path: string; key: string; value: unknown }[] = []) {
  if (Array.isArray(value)) value.forEach((v) => entriesIn(v, `${at}[]`, into));
  else if (value && typeof value === "object") {
    for (const [key, v] of Object.entries(value)) {
      into.push({ path: `${at}.${key}`, key, value: v });
      entriesIn(v, `${at}.${key}`, into);
    }
  }
  return into;
}

function expectNoInternalState(json: unknown) {
  const all = entriesIn(json);
  // The only numbers that name things are the ones in public addresses: /sites/:id and /varieties/:id.
  const ids = all.filter((e) => /id$/i.test(e.key) || /^id/.test(e.key));
  for (const e of ids) expect(["$.sites[].id", "$.entries[].varietyId"].includes(e.path), e.path).toBe(true);
  for (const e of ids.filter((x) => x.path === "$.sites[].id")) expect(facts.siteIds).toContain(e.value);
  for (const e of ids.filter((x) => x.path === "$.entries[].varietyId")) expect(facts.varietyIds).toContain(e.value);
  const keys = new Set(all.map((e) => e.key));
  for (const key of ["shared", "resultsShared", "included", "why", "includeUnaccepted", "siteIds", "createdBy", "createdAt", "schemaVersion", "entryNumber"]) expect(keys.has(key), key).toBe(false);
  // Review states: no value anywhere is one of the sites' submission statuses, and no sentence tells one.
  for (const e of all) if (typeof e.value === "string") expect(facts.statuses, `${e.path} = ${e.value}`).not.toContain(e.value);
  expect(JSON.stringify(json)).not.toMatch(/not accepted yet|submitted|returned for corrections|still in draft/i);
}

// The last outbox row before the publication here, so its notices can be removed afterwards.
let mailMark = 0;

beforeAll(async () => {
  const [lastMail] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = lastMail?.id ?? 0;
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  const [t] = await db.select({ id: s.trials.id, status: s.trials.status }).from(s.trials).where(eq(s.trials.code, CODE));
  trial = t!;
  const enrolled = await db
    .select({ siteId: s.enrolments.siteId, status: s.submissions.status })
    .from(s.enrolments)
    .leftJoin(s.submissions, eq(s.submissions.enrolmentId, s.enrolments.id))
    .where(eq(s.enrolments.trialId, trial.id));
  const entries = await db.select({ varietyId: s.trialEntries.varietyId }).from(s.trialEntries).where(eq(s.trialEntries.trialId, trial.id));
  const statuses = [...new Set(enrolled.map((e) => e.status ?? "draft"))];
  // At least one site's data are not accepted (submitted in the demo; review tests may have returned it).
  expect(statuses.some((x) => x !== "accepted")).toBe(true);
  facts = { siteIds: enrolled.map((e) => e.siteId), varietyIds: entries.map((e) => e.varietyId), statuses, sharedSite: enrolled[0]!.siteId };
  await db.update(s.enrolments).set({ resultsShared: true }).where(and(eq(s.enrolments.trialId, trial.id), eq(s.enrolments.siteId, facts.sharedSite)));
  // Published as the coordinator confirms it on the page: without the sites whose data are not accepted.
  const confirmedLeftOut = leftOutSiteIds((await readSiteInclusion(coordinator, trial.id))!);
  await publishResults(coordinator, { trialId: trial.id, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: null, confirmedLeftOut });
});

afterAll(async () => {
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), like(s.mailOutbox.subject, "Results published%")));
  await db.delete(s.publishedReports).where(eq(s.publishedReports.trialId, trial.id));
  await db.update(s.trials).set({ status: trial.status }).where(eq(s.trials.id, trial.id));
  await db.update(s.enrolments).set({ resultsShared: false }).where(and(eq(s.enrolments.trialId, trial.id), inArray(s.enrolments.siteId, facts.siteIds)));
  await pool.end();
  await appPool.end();
});

describe("public outputs carry only what a reader needs", () => {
  it("the public JSON of a trial has no review state, sharing flag or internal id, though the stored snapshot has them", async () => {
    // The stored row keeps the whole record, as rows published before the public shape did: it is mapped as it is read.
    const [row] = await db.select({ snapshot: s.publishedReports.snapshot }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trial.id));
    expect(row!.snapshot).toMatch(/"shared":true/);
    expect(row!.snapshot).toMatch(/not accepted yet/);
    const ctx = { params: Promise.resolve({ code: CODE }) };
    const res = await publicJson(new Request(`http://t/api/public/v1/trials/${CODE}`), ctx);
    expect(res.status).toBe(200);
    const json = await res.json();
    expect(json.code).toBe(CODE);
    expectNoInternalState(json);
    const results = await (await publicResults(new Request(`http://t/api/public/v1/trials/${CODE}/results`), ctx)).json();
    expect(results.results.length).toBeGreaterThan(0);
    expectNoInternalState(results);
    expectNoInternalState(await (await publicPlots(new Request(`http://t/api/public/v1/trials/${CODE}/plots`), ctx)).json());
    const list = await (await publicList(new Request(`http://t/api/public/v1/trials?q=${CODE}`))).json();
    expect(list.trials.map((x: { code: string }) => x.code)).toContain(CODE);
    expectNoInternalState(list);
  });

  it("the public variety and site views, the data download and the PDF carry no review state or internal id", async () => {
    expectNoInternalState(await getPublicVariety(facts.varietyIds[0]!));
    expectNoInternalState(await getPublicSite(facts.siteIds[0]!));
    const ctx = { params: Promise.resolve({ code: CODE }) };
    const csv = await (await publicData(new Request(`http://t/results/${CODE}/data?format=csv`), ctx)).text();
    expect(csv).not.toMatch(/submitted|not accepted|shared/i);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await (await publicData(new Request(`http://t/results/${CODE}/data?format=xlsx`), ctx)).arrayBuffer());
    const cells: string[] = [];
    for (const sheet of book.worksheets) sheet.eachRow((row) => row.eachCell((c) => void cells.push(String(c.value))));
    expect(cells.join("\n")).not.toMatch(/submitted|not accepted|shared/i);
    const pdf = Buffer.from(await (await publicReport(new Request(`http://t/results/${CODE}/report`), ctx)).arrayBuffer());
    const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-public-"));
    await fs.writeFile(path.join(dir, "r.pdf"), pdf);
    expect(execFileSync("pdftotext", [path.join(dir, "r.pdf"), "-"]).toString()).not.toMatch(/submitted|not accepted yet/i);
  }, 60_000);
});
