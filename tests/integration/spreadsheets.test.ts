import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import ExcelJS from "exceljs";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import { UPLOAD_CORPUS, type CorpusContext } from "../helpers/bad-uploads";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { csvExportForViewer, templateForViewer } from "@/server/spreadsheets/files";
import { commitUpload, previewUpload } from "@/server/spreadsheets/upload";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";
import { csvRow } from "@/lib/domain/spreadsheets/write";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { isAppError } from "@/lib/errors";

const { db, pool } = testDatabase();
let tomas: Viewer;
let mei: Viewer;
let rosa: Viewer;
let willow: Awaited<ReturnType<typeof demoSite>>;
let cedar: Awaited<ReturnType<typeof demoSite>>;
let template: Uint8Array;
let grid: string[][];

const enc = (t: string) => new TextEncoder().encode(t);
const toCsv = (g: string[][]) => g.map((r) => r.map((v) => (/[",]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(",")).join("\n");
const col = (key: string) => {
  const headings: Record<string, string> = {
    quality: "Overall quality [1-9]",
    marketable_yield: "Marketable yield [g per plot]",
    harvest_date: "First harvest date",
    "emergence_count@5": "Seedlings emerged (count) day 5 [seedlings]",
    "emergence_count@14": "Seedlings emerged (count) day 14 [seedlings]",
  };
  const i = grid[0]!.indexOf(headings[key]!);
  if (i < 0) throw new Error(`no column ${key} in ${grid[0]!.join("|")}`);
  return i + 1;
};
const target = (bytes: Uint8Array, fileName: string) => ({ trialId: willow.trialId, siteId: willow.siteId, bytes, fileName });

beforeAll(async () => {
  [tomas, mei, rosa] = await Promise.all([demoViewer(db, "tomas@willowbend.example"), demoViewer(db, "mei@cedarhollow.example"), demoViewer(db, "rosa.delgado@tamarack-valley.example")]);
  willow = await demoSite(db, "TV27-KAL", "Willow Bend Farm");
  cedar = await demoSite(db, "TV27-KAL", "Cedar Hollow Market Garden");
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, willow.plots.map((p) => p.id)), inArray(s.observations.traitId, [willow.traitId.quality!, willow.traitId.marketable_yield!, willow.traitId.harvest_date!])));
  await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, willow.enrolmentId));
  template = new Uint8Array((await templateForViewer(tomas, { trialId: willow.trialId, siteId: willow.siteId })).body);
  grid = parseCsv((await csvExportForViewer(tomas, { trialId: willow.trialId, siteId: willow.siteId })).body);
  while (grid.length && grid.at(-1)!.every((c) => c === "")) grid.pop();
});

afterAll(async () => {
  await pool.end();
});

describe("spreadsheet template", () => {
  it("has plots in layout order, one column per value with its unit, validation, a frozen header and a data dictionary", async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(template as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Plots")!;
    expect(ws.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    expect(header.slice(0, 3)).toEqual(["Plot", "Block", "Code"]);
    expect(header).toContain("Seedlings emerged (count) day 7 [seedlings]");
    expect(header).toContain("Overall quality [1-9]");
    expect(ws.getColumn(1).values.slice(2)).toEqual(willow.plots.map((p) => p.plotCode));
    const q = ws.getCell(2, col("quality")).dataValidation;
    // Whole numbers 1 to 9, or a "missing: ..." cell saying why there is no value.
    const at = ws.getCell(2, col("quality")).address;
    expect(q).toMatchObject({ type: "custom", formulae: [`OR(LEFT(TRIM(${at}),7)="missing",AND(ISNUMBER(${at}),${at}=INT(${at}),${at}>=1,${at}<=9))`] });
    expect(ws.getCell(2, col("harvest_date")).dataValidation?.formulae?.[0]).toMatch(/ISNUMBER\([A-Z]+2\),[A-Z]+2>=DATE\(\d{4},\d{1,2},\d{1,2}\)/);
    // Values already recorded come pre-filled, so the sheet can be corrected and uploaded again.
    expect(ws.getCell(2, col("emergence_count@5")).value).toEqual(expect.any(Number));
    const dict = wb.getWorksheet("Data dictionary")!;
    const dictText = JSON.stringify(dict.getSheetValues());
    expect(dictText).toContain("whole number 1 to 9");
    expect(dictText).toMatch(/Day 7 after sowing \(2026-11-22\)|Day 7 after sowing/);
    expect(JSON.stringify(wb.model)).not.toMatch(/Heron Lacinato|Thistledown/);
  });

  it("is only given to the site's own grower or staff", async () => {
    await expect(templateForViewer(mei, { trialId: willow.trialId, siteId: willow.siteId })).rejects.toMatchObject({ code: "not_found" });
    await expect(templateForViewer(rosa, { trialId: willow.trialId, siteId: willow.siteId })).resolves.toBeTruthy();
  });
});

describe("the generated corpus of hostile and sloppy uploads", () => {
  // Each variant is judged as it must be, tells the grower what the corpus says, and a refused file writes nothing.
  let ctx: CorpusContext;
  const dir = path.resolve("tests/output/bad-uploads");
  beforeAll(() => {
    ctx = { template, grid, foreignPlotCode: cedar.plots[0]!.plotCode, columnOf: col };
    mkdirSync(dir, { recursive: true });
  });

  for (const v of UPLOAD_CORPUS) {
    it(v.rule, async () => {
      const bytes = await v.build(ctx);
      writeFileSync(path.join(dir, v.name), bytes);
      const before = await writeCounts(db, willow.enrolmentId);
      const preview = await previewUpload(tomas, target(bytes, v.name));
      const words =
        preview.refused ??
        (v.judgement === "accepted" && preview.ok
          ? `sheet ${preview.sheet ?? "none"}; not read ${preview.otherSheets.join(", ")}; new ${preview.changes.map((c) => `${c.column} = ${c.newValue}`).join(", ")}`
          : preview.problems.map((p) => `Row ${p.row}, ${p.column}: ${p.message}`).join("\n"));
      expect(words).toMatch(v.expect(ctx));
      if (v.never) expect(words).not.toMatch(v.never);
      if (v.judgement === "accepted") {
        expect(preview.problems).toEqual([]);
        expect(preview.ok).toBe(true);
      } else {
        expect(preview.ok).toBe(false);
        if (v.judgement === "refused") expect(preview.refused).toBeTruthy();
        else expect(preview.refused === null && preview.problems[0]!.row! > 1).toBe(true);
        const commit = await commitUpload(tomas, target(bytes, v.name));
        expect(commit.ok).toBe(false);
      }
      expect(await writeCounts(db, willow.enrolmentId)).toEqual(before);
    }, 60_000);
  }
});

describe("uploading a filled-in sheet", () => {
  it("a CSV separated by semicolons saves a decimal comma as a decimal", async () => {
    const edited = grid.map((r) => [...r]);
    edited[4]![col("marketable_yield") - 1] = "12873,5";
    const csv = edited.map((r) => r.map((v) => (/[";\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(";")).join("\r\n");
    const saved = await commitUpload(tomas, target(enc(csv), "willow-semicolons.csv"));
    expect(saved).toMatchObject({ ok: true, saved: 1 });
    const plot = willow.plots.find((p) => p.plotCode === edited[4]![0])!;
    const [y] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plot.id), eq(s.observations.traitId, willow.traitId.marketable_yield!)));
    expect(y!.valueNumber).toBe(12873.5);
    await db.delete(s.observations).where(eq(s.observations.id, y!.id));
  });

  it("previews new, changed and unchanged values before writing anything, and names rows and columns", async () => {
    const edited = grid.map((r) => [...r]);
    edited[1]![col("quality") - 1] = "7";
    edited[2]![col("quality") - 1] = "6";
    edited[3]![col("marketable_yield") - 1] = "182,5";
    const oldDay5 = Number(edited[1]![col("emergence_count@5") - 1]);
    edited[1]![col("emergence_count@5") - 1] = String(oldDay5 === 0 ? 1 : oldDay5 - 1);
    edited.splice(5, 0, ["", "", "", ...edited[0]!.slice(3).map(() => "")]);
    const before = await writeCounts(db, willow.enrolmentId);
    const preview = await previewUpload(tomas, target(enc(toCsv(edited)), "willow.csv"));
    expect(preview.problems).toEqual([]);
    expect(preview.ok).toBe(true);
    if (!preview.ok || preview.refused) throw new Error("preview failed");
    expect(preview.counts).toEqual({ new: 3, changed: 1, unchanged: before.observations - 1 });
    expect(preview.blankRows).toEqual([6]);
    expect(preview.changes.find((c) => c.kind === "changed")).toMatchObject({ row: 2, oldValue: String(oldDay5) });
    expect(await writeCounts(db, willow.enrolmentId)).toEqual(before);

    const committed = await commitUpload(tomas, target(enc(toCsv(edited)), "willow.csv"));
    expect(committed).toMatchObject({ ok: true, saved: 4 });
    const after = await writeCounts(db, willow.enrolmentId);
    expect(after.observations - before.observations).toBe(3);
    expect(after.history - before.history).toBe(1);
    expect(after.audit - before.audit).toBe(4);

    // Uploading a corrected copy updates in place and keeps the earlier value in history.
    edited[1]![col("quality") - 1] = "8";
    const again = await commitUpload(tomas, target(enc(toCsv(edited)), "willow-corrected.csv"));
    expect(again).toMatchObject({ ok: true, saved: 1, counts: { new: 0, changed: 1 } });
    const [q] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, willow.plots[0]!.id), eq(s.observations.traitId, willow.traitId.quality!)));
    expect(q!.valueNumber).toBe(8);
    const hist = await db.select().from(s.observationHistory).where(eq(s.observationHistory.observationId, q!.id));
    expect(hist.map((h) => h.valueNumber)).toEqual([7]);
    expect((await writeCounts(db, willow.enrolmentId)).observations).toBe(after.observations);
  });

  it("an .xlsx upload with dates typed by Excel is read; one bad row at the end means nothing is written", async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(template as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Plots")!;
    const last = willow.plots.length + 1;
    for (let r = 2; r <= last; r += 1) {
      ws.getCell(r, col("harvest_date")).value = new Date("2026-11-30T00:00:00Z");
      ws.getCell(r, col("marketable_yield")).value = 150 + r;
    }
    ws.getCell(last, col("marketable_yield")).value = "lots";
    const bytes = new Uint8Array(await wb.xlsx.writeBuffer());
    const before = await writeCounts(db, willow.enrolmentId);
    const preview = await previewUpload(tomas, target(bytes, "willow.xlsx"));
    expect(preview.ok).toBe(false);
    expect(preview.problems).toEqual([{ row: last, column: expect.stringMatching(/^column [A-Z]+ \(Marketable yield \[g per plot\]\)$/), message: expect.stringMatching(/"lots" is not a number/) }]);
    expect((await commitUpload(tomas, target(bytes, "willow.xlsx"))).ok).toBe(false);
    expect(await writeCounts(db, willow.enrolmentId)).toEqual(before);

    ws.getCell(last, col("marketable_yield")).value = 140;
    const fixed = new Uint8Array(await wb.xlsx.writeBuffer());
    const ok = await commitUpload(tomas, target(fixed, "willow.xlsx"));
    expect(ok.ok).toBe(true);
    const [d] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, willow.plots[0]!.id), eq(s.observations.traitId, willow.traitId.harvest_date!)));
    expect(d!.valueDate).toBe("2026-11-30");
  });

  it("another grower cannot preview or upload into this site", async () => {
    const before = await writeCounts(db, willow.enrolmentId);
    await expect(previewUpload(mei, target(enc(toCsv(grid)), "x.csv"))).rejects.toMatchObject({ code: "not_found" });
    await expect(commitUpload(mei, target(enc(toCsv(grid)), "x.csv"))).rejects.toMatchObject({ code: "not_found" });
    expect(await writeCounts(db, willow.enrolmentId)).toEqual(before);
  });
});

describe("exports", () => {
  it("neutralise cells that a spreadsheet would run as formulas", async () => {
    expect(csvRow(["=HYPERLINK(\"http://x\")", "+1", "-2", "@SUM(A1)", "plain", 3, -4])).toBe("\"'=HYPERLINK(\"\"http://x\"\")\",'+1,'-2,'@SUM(A1),plain,3,-4");
    const lettuce = await demoSite(db, "TV26-LET", "Willow Bend Farm");
    const plotId = lettuce.plots[0]!.id;
    await saveObservationsForViewer(rosa, { trialId: lettuce.trialId, siteId: lettuce.siteId, values: [{ plotId, key: "plot_notes", value: "=cmd|' /C calc'!A0" }] });
    const csv = (await csvExportForViewer(rosa, { trialId: lettuce.trialId, siteId: lettuce.siteId })).body;
    expect(csv).toContain("'=cmd|' /C calc'!A0");
    expect(csv).not.toMatch(/(^|,)=cmd/m);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await templateForViewer(rosa, { trialId: lettuce.trialId, siteId: lettuce.siteId })).body as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Plots")!;
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    const cell = ws.getCell(2, header.indexOf("Plot notes") + 1);
    expect(cell.type).toBe(ExcelJS.ValueType.String);
    expect(cell.value).toBe("'=cmd|' /C calc'!A0");
  });
});

it("helper sanity: AppError is recognised", () => {
  expect(isAppError(new Error("x"))).toBe(false);
});
