import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { getReviewSheet, listReviewQueue } from "@/server/review/sheets";
import { csvExportForViewer } from "@/server/spreadsheets/files";
import { commitUpload, previewUpload } from "@/server/spreadsheets/upload";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";
import { addDays } from "@/lib/domain/schedule";

// Date-order checks through the real save and upload paths: impossible dates are refused and write nothing;
// unlikely ones save and reach the coordinator's Values to check.

const { db, pool } = testDatabase();
let hannah: Viewer;
let rosa: Viewer;
let lark: Awaited<ReturnType<typeof demoSite>>;
let recoveryTraitId = 0;
const at = (days: number) => addDays(lark.sownOn!, days);
const enc = (t: string) => new TextEncoder().encode(t);
const toCsv = (g: string[][]) => g.map((r) => r.map((v) => (/[",]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v)).join(",")).join("\n");

async function storedDate(plotId: number, traitId: number) {
  const [row] = await db.select({ v: s.observations.valueDate }).from(s.observations).where(and(eq(s.observations.plotId, plotId), eq(s.observations.traitId, traitId)));
  return row?.v ?? null;
}
async function packetDaysOf(plotId: number) {
  const [row] = await db
    .select({ days: s.seedLots.packetDaysToMaturity })
    .from(s.plots)
    .innerJoin(s.trialEntries, eq(s.trialEntries.id, s.plots.entryId))
    .innerJoin(s.seedLots, eq(s.seedLots.id, s.trialEntries.seedLotId))
    .where(eq(s.plots.id, plotId));
  return row!.days!;
}
async function sheetGrid() {
  const grid = parseCsv((await csvExportForViewer(hannah, { trialId: lark.trialId, siteId: lark.siteId })).body);
  while (grid.length && grid.at(-1)!.every((c) => c === "")) grid.pop();
  const col = (heading: string) => {
    const i = grid[0]!.indexOf(heading);
    if (i < 0) throw new Error(`no column ${heading} in ${grid[0]!.join("|")}`);
    return i;
  };
  const rowOf = (plotCode: string) => grid.findIndex((r) => r[0] === plotCode);
  return { grid, col, rowOf };
}
const upload = (text: string) => ({ trialId: lark.trialId, siteId: lark.siteId, bytes: enc(text), fileName: "larkspur.csv" });

beforeAll(async () => {
  [hannah, rosa] = await Promise.all([demoViewer(db, "hannah@larkspur.example"), demoViewer(db, "rosa.delgado@tamarack-valley.example")]);
  lark = await demoSite(db, "TV27-KAL", "Larkspur Acres");
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, lark.plots.map((p) => p.id)), inArray(s.observations.traitId, [lark.traitId.harvest_date!, lark.traitId.emergence_date!])));
  await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, lark.enrolmentId));
});

afterAll(async () => {
  if (recoveryTraitId) {
    await db.delete(s.observations).where(eq(s.observations.traitId, recoveryTraitId));
    await db.delete(s.trialTraits).where(eq(s.trialTraits.traitId, recoveryTraitId));
    await db.delete(s.traits).where(eq(s.traits.id, recoveryTraitId));
  }
  await db.update(s.enrolments).set({ transplantedOn: null }).where(eq(s.enrolments.id, lark.enrolmentId));
  // The demo records no dates at this site yet; leave it so for the files after this one.
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, lark.plots.map((p) => p.id)), inArray(s.observations.traitId, [lark.traitId.harvest_date!, lark.traitId.emergence_date!])));
  await pool.end();
});

describe("date-order checks on the phone form's save", () => {
  it("a harvest date before emergence and one day after sowing saves, with warnings that never state the packet's figure", async () => {
    const plot = lark.plots[0]!;
    const result = await saveObservationsForViewer(hannah, {
      trialId: lark.trialId,
      siteId: lark.siteId,
      values: [
        { plotId: plot.id, key: "emergence_date", value: at(3) },
        { plotId: plot.id, key: "harvest_date", value: at(1) },
      ],
    });
    expect(result.saved).toBe(2);
    expect(await storedDate(plot.id, lark.traitId.harvest_date!)).toBe(at(1));
    expect(result.warnings.map((w) => [w.plotId, w.key, w.kind])).toEqual([
      [plot.id, "harvest_date", "date_order"],
      [plot.id, "harvest_date", "far_from_packet"],
    ]);
    expect(result.warnings[0]!.message).toMatch(/^First harvest on .+ is before emergence on .+ in this plot — check both dates\.$/);
    expect(result.warnings[1]!.message).toMatch(/is 1 day after sowing, much sooner than this entry is expected to be ready — check the date\.$/);
    // Growers record blind: the packet's days to maturity would help tell the entries apart.
    const said = result.warnings.map((w) => w.message).join(" ");
    expect(said).not.toMatch(/packet|maturity/);
    expect(said).not.toContain(`${await packetDaysOf(plot.id)} days`);
  });

  it("correcting only the emergence date still warns, on the emergence date, while the pair stays out of order", async () => {
    const plot = lark.plots[0]!;
    const result = await saveObservationsForViewer(hannah, { trialId: lark.trialId, siteId: lark.siteId, values: [{ plotId: plot.id, key: "emergence_date", value: at(2) }] });
    expect(result.warnings.map((w) => [w.key, w.kind])).toEqual([["emergence_date", "date_order"]]);
    const fixed = await saveObservationsForViewer(hannah, { trialId: lark.trialId, siteId: lark.siteId, values: [{ plotId: plot.id, key: "emergence_date", value: at(0) }] });
    expect(fixed.warnings.filter((w) => w.kind === "date_order")).toEqual([]);
    await saveObservationsForViewer(hannah, { trialId: lark.trialId, siteId: lark.siteId, values: [{ plotId: plot.id, key: "emergence_date", value: at(3) }] });
  });

  it("the coordinator's review lists the warned dates under Values to check, with the packet's figure, and counts them in the queue", async () => {
    const plot = lark.plots[0]!;
    const sheet = await getReviewSheet(rosa, lark);
    const mine = sheet!.flags.filter((f) => f.plotId === plot.id && f.key === "harvest_date");
    expect(mine.map((f) => f.kind)).toEqual(["date_order", "far_from_packet"]);
    expect(mine[1]!.message).toContain(`far from the ${await packetDaysOf(plot.id)} days to maturity on this entry's seed packet`);
    const queued = (await listReviewQueue(rosa)).find((r) => r.trialId === lark.trialId && r.siteId === lark.siteId)!;
    expect(queued.flags).toBeGreaterThanOrEqual(2);
    // The review sheet and its packet figures are for staff only.
    expect(await getReviewSheet(hannah, lark)).toBeNull();
  });
});

describe("date-order checks on a spreadsheet upload", () => {
  beforeAll(async () => {
    // A date counted from transplanting, at a site transplanted 4 days after sowing.
    const [trial] = await db.select({ programId: s.trials.programId }).from(s.trials).where(eq(s.trials.id, lark.trialId));
    const [t] = await db
      .insert(s.traits)
      .values({ programId: trial!.programId, code: "recovery_date", name: "Recovery date", unit: "date", valueType: "date", dueNote: "When transplants stand up again", computation: "days_from_transplant" })
      .$returningId();
    recoveryTraitId = t!.id;
    await db.insert(s.trialTraits).values({ trialId: lark.trialId, traitId: recoveryTraitId, sortOrder: 99 });
    await db.update(s.enrolments).set({ transplantedOn: at(4) }).where(eq(s.enrolments.id, lark.enrolmentId));
  });

  it("a date counted from transplanting that is before the transplanting date is refused by row and column, and nothing is written", async () => {
    const { grid, col, rowOf } = await sheetGrid();
    const [p1, p2] = [lark.plots[1]!, lark.plots[2]!];
    grid[rowOf(p1.plotCode)]![col("First harvest date")] = at(5);
    grid[rowOf(p2.plotCode)]![col("First harvest date")] = at(5);
    grid[rowOf(p2.plotCode)]![col("Recovery date")] = at(2);
    const before = await writeCounts(db, lark.enrolmentId);
    const preview = await previewUpload(hannah, upload(toCsv(grid)));
    expect(preview.ok).toBe(false);
    const letter = String.fromCharCode(65 + col("Recovery date"));
    expect(preview.problems).toEqual([
      {
        row: rowOf(p2.plotCode) + 1,
        column: `column ${letter} (Recovery date)`,
        message: expect.stringMatching(/^Recovery on .+ is before this site's transplanting date, .+, and it is counted in days from transplanting\. Check the date; if the transplanting date is wrong, ask your coordinator to correct it\.$/),
      },
    ]);
    const committed = await commitUpload(hannah, upload(toCsv(grid)));
    expect(committed.ok).toBe(false);
    expect(await writeCounts(db, lark.enrolmentId)).toEqual(before);
    expect(await storedDate(p1.id, lark.traitId.harvest_date!)).toBeNull();
  });

  it("a harvest date before emergence saves with every other value, and the preview names its row and column", async () => {
    const { grid, col, rowOf } = await sheetGrid();
    const p1 = lark.plots[1]!;
    const row = rowOf(p1.plotCode);
    grid[row]![col("Emergence date")] = at(5);
    grid[row]![col("First harvest date")] = at(4);
    grid[row]![col("Recovery date")] = at(5);
    const preview = await previewUpload(hannah, upload(toCsv(grid)));
    expect(preview.problems).toEqual([]);
    expect(preview.ok).toBe(true);
    const letter = String.fromCharCode(65 + col("First harvest date"));
    expect(preview.warnings).toContainEqual({ row: row + 1, column: `column ${letter} (First harvest date)`, message: expect.stringMatching(/^First harvest on .+ is before emergence on .+ in this plot — check both dates\.$/) });
    const committed = await commitUpload(hannah, upload(toCsv(grid)));
    expect(committed.ok).toBe(true);
    expect(await storedDate(p1.id, lark.traitId.harvest_date!)).toBe(at(4));
    expect(await storedDate(p1.id, recoveryTraitId)).toBe(at(5));
    const sheet = await getReviewSheet(rosa, lark);
    expect(sheet!.flags.filter((f) => f.plotId === p1.id && f.key === "harvest_date").map((f) => f.kind)).toContain("date_order");
  });
});
