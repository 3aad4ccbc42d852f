import { afterAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import * as s from "@/db/schema";
import { DEMO_TRIALS } from "@/db/demo-data";
import { toPublicSnapshot } from "@/lib/domain/publish/public-shape";
import type { PublishedSnapshot } from "@/lib/domain/publish/types";
import { testDatabase } from "../helpers/db";

// The public CSV and workbook of the demo's published trial: dates are published as days (unit "days",
// not "date"), a missing plot says why, each plot carries its seeds sown and seedlings emerged, and the
// means carry % of the check. Versions stored before these columns existed are read the same way.

const { GET: publicData } = await import("@/app/(public)/results/[code]/data/route");
const { pool: appPool } = await import("@/db/index");
const { db, pool } = testDatabase();
const TRIAL = DEMO_TRIALS.find((t) => t.publishedAtSeed)!;
const ctx = { params: Promise.resolve({ code: TRIAL.code }) };

afterAll(async () => {
  await pool.end();
  await appPool.end();
});

/** A CSV as rows of header-named cells (the first line is the citation). */
function rowsOf(csv: string): Record<string, string>[] {
  const lines = csv.trim().split(/\r?\n/).slice(1);
  const split = (l: string) => l.match(/("([^"]|"")*"|[^,]*)(,|$)/g)!.slice(0, -1).map((c) => c.replace(/,$/, "").replace(/^"|"$/g, "").replace(/""/g, '"'));
  const header = split(lines[0]!);
  return lines.slice(1).map((l) => Object.fromEntries(split(l).map((v, i) => [header[i]!, v])));
}

describe("the public data downloads", () => {
  it("plot data: days for dates, the reason of every missing plot, seeds sown and seedlings emerged per plot", async () => {
    const res = await publicData(new Request(`http://t/results/${TRIAL.code}/data?format=csv`), ctx);
    expect(res.status).toBe(200);
    const rows = rowsOf(await res.text());
    const emergence = rows.filter((r) => r.trait!.startsWith("Emergence date"));
    expect(emergence.length).toBeGreaterThan(0);
    expect(new Set(emergence.map((r) => r.unit))).toEqual(new Set(["days"]));
    expect(rows.some((r) => r.unit === "date")).toBe(false);
    const missing = rows.filter((r) => r.status === "missing");
    expect(missing.length).toBeGreaterThan(0);
    for (const r of missing) expect(r["missing reason"]).toMatch(/\w/);
    expect(missing.map((r) => r["missing reason"])).toContain("animal damage");
    for (const r of rows.filter((x) => x.status === "used")) expect(r["missing reason"]).toBe("");
    for (const r of rows) {
      expect(Number(r["seeds sown"])).toBe(30);
      expect(Number(r["seedlings emerged"])).toBeGreaterThanOrEqual(0);
      expect(Number(r["seedlings emerged"])).toBeLessThanOrEqual(30);
    }
  });

  it("means: every variety with its % of the check, the difference and whether it exceeds the LSD, in CSV and workbook", async () => {
    const rows = rowsOf(await (await publicData(new Request(`http://t/results/${TRIAL.code}/data?format=csv&table=means`), ctx)).text());
    const check = TRIAL.entries.find((e) => e.isCheck)!.variety;
    const yieldRows = rows.filter((r) => r.trait!.startsWith("Marketable yield"));
    expect(yieldRows.map((r) => r.variety).sort()).toEqual(TRIAL.entries.map((e) => e.variety).sort());
    expect(Number(yieldRows.find((r) => r.variety === check)!["% of check"])).toBeCloseTo(100, 9);
    for (const r of yieldRows) {
      expect(Number(r["% of check"])).toBeCloseTo((100 * Number(r.mean)) / Number(yieldRows.find((x) => x.variety === check)!.mean), 6);
      if (r.variety !== check) expect(["yes", "no", ""]).toContain(r["beyond LSD"]);
    }
    // ranks follow the direction: 1 is the highest yield, the earliest emergence; no rank for harvest date (no preference)
    expect(yieldRows[0]!.rank).toBe("1");
    expect(Number(yieldRows[0]!.mean)).toBe(Math.max(...yieldRows.map((r) => Number(r.mean))));
    const emergence = rows.filter((r) => r.trait!.startsWith("Emergence date"));
    expect(emergence[0]!.rank).toBe("1");
    expect(Number(emergence[0]!.mean)).toBe(Math.min(...emergence.map((r) => Number(r.mean))));
    expect(rows.filter((r) => r.trait!.startsWith("First harvest")).every((r) => r.rank === "")).toBe(true);

    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await (await publicData(new Request(`http://t/results/${TRIAL.code}/data?format=xlsx`), ctx)).arrayBuffer());
    const header = (book.getWorksheet("Means")!.getRow(1).values as unknown[]).slice(1);
    expect(header).toEqual(expect.arrayContaining(["% of check", "difference from check", "beyond LSD", "better when"]));
    const plotHeader = (book.getWorksheet("Plot data")!.getRow(1).values as unknown[]).slice(1);
    expect(plotHeader).toEqual(expect.arrayContaining(["missing reason", "seeds sown", "seedlings emerged"]));
    expect((await (await publicData(new Request(`http://t/results/${TRIAL.code}/data?format=csv&table=x`), ctx)).json()).error).toMatch(/table=plots or table=means/);
  });

  it("a version stored before plot values carried days and reasons reads with unit days and each missing plot's reason", async () => {
    const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, TRIAL.code));
    const [row] = await db.select({ snapshot: s.publishedReports.snapshot }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trial!.id)).limit(1);
    const stored = JSON.parse(row!.snapshot) as PublishedSnapshot;
    const older: PublishedSnapshot = {
      ...stored,
      data: stored.data.map(({ missingReason: _r, seedsSown: _s, emerged: _e, ...d }) => ({ ...d, unit: d.unit === "days" ? "date" : d.unit })),
    };
    const now = toPublicSnapshot(stored).data;
    const then = toPublicSnapshot(older).data;
    expect(then.map((d) => [d.unit, d.missingReason])).toEqual(now.map((d) => [d.unit, d.missingReason]));
    expect(then.every((d) => d.seedsSown === null && d.emerged === null)).toBe(true);
  });
});
