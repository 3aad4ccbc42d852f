import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import ExcelJS from "exceljs";
import { refusal } from "../helpers/refusal";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { getRecordingSheet } from "@/server/observations/sheet";
import { getReviewSheet } from "@/server/review/sheets";
import { csvExportForViewer, templateForViewer } from "@/server/spreadsheets/files";
import { commitUpload, previewUpload } from "@/server/spreadsheets/upload";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";
import { loadAnalysis } from "@/server/analysis/load-analysis";
import { getAnalysisAccess, readAnalysisVersion } from "@/db/queries/analysis";

const { db, pool } = testDatabase();
let mei: Viewer;
let rosa: Viewer;
let cedar: Awaited<ReturnType<typeof demoSite>>;
let saved: (typeof s.observations.$inferSelect)[] = [];
let touchedTraits: number[] = [];

const enc = (t: string) => new TextEncoder().encode(t);
const toCsv = (g: string[][]) => g.map((r) => r.map((v) => (/[",]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(",")).join("\n");

const save = (values: { plotId: number; key: string; value: string | null; missingReason?: string | null }[]) =>
  saveObservationsForViewer(mei, { trialId: cedar.trialId, siteId: cedar.siteId, values });

async function stored(plotId: number, trait: string) {
  const [o] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plotId), eq(s.observations.traitId, cedar.traitId[trait]!)));
  return o ?? null;
}

async function exportGrid() {
  const g = parseCsv((await csvExportForViewer(mei, { trialId: cedar.trialId, siteId: cedar.siteId })).body);
  while (g.length && g.at(-1)!.every((c) => c === "")) g.pop();
  return g;
}

beforeAll(async () => {
  [mei, rosa] = await Promise.all([demoViewer(db, "mei@cedarhollow.example"), demoViewer(db, "rosa.delgado@tamarack-valley.example")]);
  cedar = await demoSite(db, "TV27-KAL", "Cedar Hollow Market Garden");
  touchedTraits = [cedar.traitId.marketable_yield!, cedar.traitId.quality!, cedar.traitId.harvest_date!];
  // Other files read these plots too: keep what was there and put it back afterwards.
  saved = await db.select().from(s.observations).where(and(inArray(s.observations.plotId, cedar.plots.map((p) => p.id)), inArray(s.observations.traitId, touchedTraits)));
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, cedar.plots.map((p) => p.id)), inArray(s.observations.traitId, touchedTraits)));
  await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, cedar.enrolmentId));
});

afterAll(async () => {
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, cedar.plots.map((p) => p.id)), inArray(s.observations.traitId, touchedTraits)));
  if (saved.length > 0) await db.insert(s.observations).values(saved);
  await pool.end();
});

describe("saying why a plot has no value, on the phone form", () => {
  it("saves a reason with an audit entry, shows it back, and a value later replaces it (and the other way round)", async () => {
    const plot = cedar.plots[10]!;
    const before = await writeCounts(db, cedar.enrolmentId);
    const first = await save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "died" }]);
    expect(first).toMatchObject({ saved: 1, counts: { new: 1 } });
    expect(await stored(plot.id, "marketable_yield")).toMatchObject({ missingReason: "died", valueNumber: null, valueDate: null, valueText: null, recordedById: mei.id });
    const sheet = await getRecordingSheet(mei, cedar);
    expect(sheet!.missing[plot.id]).toEqual({ marketable_yield: "died" });

    // Saving the same reason again changes nothing.
    expect((await save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "died" }])).saved).toBe(0);

    const value = await save([{ plotId: plot.id, key: "marketable_yield", value: "150", missingReason: null }]);
    expect(value.counts).toMatchObject({ changed: 1 });
    expect(await stored(plot.id, "marketable_yield")).toMatchObject({ missingReason: null, valueNumber: 150 });
    expect((await getRecordingSheet(mei, cedar))!.missing[plot.id]).toBeUndefined();

    await save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "animal_damage" }]);
    const o = (await stored(plot.id, "marketable_yield"))!;
    expect(o).toMatchObject({ missingReason: "animal_damage", valueNumber: null });
    const audit = await db.select().from(s.auditLog).where(and(eq(s.auditLog.entity, "observation"), eq(s.auditLog.entityId, String(o.id)))).orderBy(desc(s.auditLog.id));
    expect(audit.map((a) => [a.action, (a.oldValue as { value?: string } | null)?.value ?? null, (a.newValue as { value: string }).value])).toEqual([
      ["observation.change", "150", "missing: animals"],
      ["observation.change", "missing: died", "150"],
      ["observation.record", null, "missing: died"],
    ]);
    const after = await writeCounts(db, cedar.enrolmentId);
    expect(after.observations - before.observations).toBe(1);
    expect(after.audit - before.audit).toBe(3);
    expect(after.history - before.history).toBe(2);
  });

  it("refuses a value and a reason at once, and an unknown reason, writing nothing", async () => {
    const plot = cedar.plots[11]!;
    const before = await writeCounts(db, cedar.enrolmentId);
    const both = await refusal(save([{ plotId: plot.id, key: "marketable_yield", value: "120", missingReason: "weather" }]));
    expect(both.code).toBe("bad_request");
    expect(both.message).toBe("Enter a value or choose why there is none, not both.");
    const unknown = await refusal(save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "frost" }]));
    expect(unknown.message).toMatch(/Choose one of the listed reasons/);
    // A good reason in the same batch as a bad value is not saved either.
    await refusal(save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "weather" }, { plotId: plot.id, key: "quality", value: "12" }]));
    expect(await writeCounts(db, cedar.enrolmentId)).toEqual(before);
    expect(await stored(plot.id, "marketable_yield")).toBeNull();
  });

  it("the analysis lists the plot as missing with its reason in words", async () => {
    const plot = cedar.plots[12]!;
    // A site with no value at all is left out of the missing list, so give it one.
    await save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "lost_label" }, { plotId: cedar.plots[13]!.id, key: "marketable_yield", value: "140" }]);
    const loaded = await loadAnalysis(rosa, cedar.trialId, { trait: cedar.traitId.marketable_yield!, unaccepted: true });
    const row = loaded!.result.missing.find((m) => m.plotCode === plot.plotCode);
    expect(row).toMatchObject({ siteName: "Cedar Hollow Market Garden", reason: "label lost" });

    // One reason swapped for another within the same second (updated_at kept) still gives a new version,
    // so the cached analysis is not served with the old words.
    const traits = [cedar.traitId.marketable_yield!];
    const before = await readAnalysisVersion((await getAnalysisAccess(rosa, cedar.trialId))!, traits);
    await db.update(s.observations).set({ missingReason: "weather", updatedAt: sql`updated_at` }).where(and(eq(s.observations.plotId, plot.id), eq(s.observations.traitId, traits[0]!)));
    expect(await readAnalysisVersion((await getAnalysisAccess(rosa, cedar.trialId))!, traits)).not.toBe(before);
  });
});

describe("saying why a plot has no value, in review", () => {
  it("counts a reason as dealt with in the coordinator's completeness figure", async () => {
    let plot = cedar.plots[0]!;
    for (const candidate of cedar.plots) {
      if (!(await stored(candidate.id, "marketable_yield"))) {
        plot = candidate;
        break;
      }
    }
    expect(await stored(plot.id, "marketable_yield")).toBeNull();
    const before = (await getReviewSheet(rosa, cedar))!.completeness;
    await save([{ plotId: plot.id, key: "marketable_yield", value: null, missingReason: "weather" }]);
    const after = (await getReviewSheet(rosa, cedar))!;
    expect(after.completeness.expected).toBe(before.expected);
    expect(after.completeness.recorded).toBe(before.recorded + 1);
    expect(after.missing[plot.id]?.marketable_yield).toBe("weather");
  });
});

describe("saying why a plot has no value, in a spreadsheet", () => {
  it("an upload with one unknown reason names its row and column and writes nothing; fixed, it writes every reason; the export round-trips", async () => {
    const grid = await exportGrid();
    const yieldCol = grid[0]!.indexOf("Marketable yield [g per plot]");
    const qualityCol = grid[0]!.indexOf("Overall quality [1-9]");
    const dateCol = grid[0]!.indexOf("First harvest date");
    expect(Math.min(yieldCol, qualityCol, dateCol)).toBeGreaterThan(2);
    const rows = [15, 16, 17];
    const plotAt = (r: number) => cedar.plots.find((p) => p.plotCode === grid[r]![0])!;
    grid[rows[0]!]![yieldCol] = "missing: died";
    grid[rows[0]!]![dateCol] = "Missing - Plants died";
    grid[rows[1]!]![qualityCol] = "missing: not sown";
    grid[rows[2]!]![yieldCol] = "missing: frost";
    const before = await writeCounts(db, cedar.enrolmentId);

    const preview = await previewUpload(mei, { trialId: cedar.trialId, siteId: cedar.siteId, bytes: enc(toCsv(grid)), fileName: "cedar.csv" });
    expect(preview.ok).toBe(false);
    expect(preview.problems).toEqual([
      {
        row: rows[2]! + 1,
        column: `column ${String.fromCharCode(65 + yieldCol)} (Marketable yield [g per plot])`,
        message: expect.stringMatching(/^"frost" is not one of the reasons\. Write missing: and one of not sown, died, animals, label lost, weather, other/),
      },
    ]);
    expect((await commitUpload(mei, { trialId: cedar.trialId, siteId: cedar.siteId, bytes: enc(toCsv(grid)), fileName: "cedar.csv" })).ok).toBe(false);
    expect(await writeCounts(db, cedar.enrolmentId)).toEqual(before);

    grid[rows[2]!]![yieldCol] = "missing: weather";
    const ok = await commitUpload(mei, { trialId: cedar.trialId, siteId: cedar.siteId, bytes: enc(toCsv(grid)), fileName: "cedar.csv" });
    expect(ok).toMatchObject({ ok: true, saved: 4, counts: { new: 4 } });
    expect(await stored(plotAt(rows[0]!).id, "marketable_yield")).toMatchObject({ missingReason: "died", valueNumber: null });
    expect(await stored(plotAt(rows[0]!).id, "harvest_date")).toMatchObject({ missingReason: "died", valueDate: null });
    expect(await stored(plotAt(rows[1]!).id, "quality")).toMatchObject({ missingReason: "not_sown" });
    expect(await stored(plotAt(rows[2]!).id, "marketable_yield")).toMatchObject({ missingReason: "weather" });

    // The export writes reasons the way the upload reads them, so uploading it again changes nothing.
    const exported = await exportGrid();
    expect(exported[rows[0]!]![dateCol]).toBe("missing: died");
    expect(exported[rows[1]!]![qualityCol]).toBe("missing: not sown");
    const again = await commitUpload(mei, { trialId: cedar.trialId, siteId: cedar.siteId, bytes: enc(toCsv(exported)), fileName: "cedar-export.csv" });
    expect(again).toMatchObject({ ok: true, saved: 0, counts: { new: 0, changed: 0 } });

    // A value typed over a reason replaces it.
    exported[rows[2]!]![yieldCol] = "95";
    expect(await commitUpload(mei, { trialId: cedar.trialId, siteId: cedar.siteId, bytes: enc(toCsv(exported)), fileName: "cedar-fixed.csv" })).toMatchObject({ ok: true, saved: 1 });
    expect(await stored(plotAt(rows[2]!).id, "marketable_yield")).toMatchObject({ missingReason: null, valueNumber: 95 });
  });

  it("the workbook fills reasons in, lets Excel accept missing: cells and explains them in the data dictionary", async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await templateForViewer(mei, { trialId: cedar.trialId, siteId: cedar.siteId })).body as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Plots")!;
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    const yieldCol = header.indexOf("Marketable yield [g per plot]") + 1;
    const row = 2 + cedar.plots.findIndex((p) => p.id === cedar.plots[10]!.id);
    expect(ws.getCell(row, yieldCol).value).toBe("missing: animals");
    const dv = ws.getCell(row, yieldCol).dataValidation;
    expect(dv.type).toBe("custom");
    expect(dv.formulae?.[0]).toContain(`LEFT(TRIM(${ws.getCell(row, yieldCol).address}),7)="missing"`);
    expect(dv.formulae?.[0]).toContain(">=0");
    // Yes/no cells offer the reasons in their drop-down list.
    const lettuce = await demoSite(db, "TV26-LET", "Willow Bend Farm");
    const lwb = new ExcelJS.Workbook();
    await lwb.xlsx.load((await templateForViewer(rosa, { trialId: lettuce.trialId, siteId: lettuce.siteId })).body as unknown as ArrayBuffer);
    const lws = lwb.getWorksheet("Plots")!;
    const bolting = ((lws.getRow(1).values as unknown[]).slice(1)).indexOf("Bolting at harvest") + 1;
    expect(lws.getCell(2, bolting).dataValidation).toMatchObject({ type: "list", formulae: ['"yes,no,missing: not sown,missing: died,missing: animals,missing: label lost,missing: weather,missing: other"'] });
    const dict = JSON.stringify(wb.getWorksheet("Data dictionary")!.getSheetValues());
    expect(dict).toContain('write missing: and why in its cell instead, for example \\"missing: died\\". The reasons are not sown, died, animals, label lost, weather, other.');
  });
});
