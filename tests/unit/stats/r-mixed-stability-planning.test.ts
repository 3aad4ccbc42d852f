// Stability (Finlay-Wilkinson, Wricke, Shukla, GGE) and trial planning against R 4.2.2: the cases in
// tests/fixtures/r-mixed (copied unchanged from the shared reference set; its README.md is the source
// note, scripts/make_mixed.R the code that made every number). Tolerance: 1e-9, as the README states.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { isStatsError, noncentralTCdf, planTrial, stability, type CellMean } from "@/lib/domain/stats";
import { FIXTURES, readJson } from "./fixtures";

const TOLERANCE = 1e-9;
const close = (actual: number, expected: number) => Math.abs(actual - expected) <= TOLERANCE * Math.max(1, Math.abs(expected));

/** Cell means over blocks, missing plots dropped, as the R script's aggregate(value ~ entry + env). */
function cellMeansOf(caseName: string): CellMean[] {
  const lines = readFileSync(path.join(FIXTURES, "r-mixed", `${caseName}.csv`), "utf8").trim().split(/\r?\n/);
  const header = lines[0]!.split(",").map((h) => h.replaceAll('"', ""));
  const cells = new Map<string, { environment: string; entry: string; sum: number; n: number }>();
  for (const line of lines.slice(1)) {
    const row = Object.fromEntries(line.split(",").map((c, i) => [header[i], c.replaceAll('"', "")]));
    if (row.value === "") continue;
    const environment = row.year ? `${row.site} ${row.year}` : row.site!;
    const key = `${environment}|${row.entry}`;
    const cell = cells.get(key) ?? { environment, entry: row.entry!, sum: 0, n: 0 };
    cell.sum += Number(row.value);
    cell.n += 1;
    cells.set(key, cell);
  }
  return [...cells.values()].map((c) => ({ environment: c.environment, entry: c.entry, mean: c.sum / c.n }));
}

const analysis = (caseName: string, id: string) => readJson(`r-mixed/${caseName}.json`).analyses.find((a: { id: string }) => a.id === id);

for (const caseName of ["mix-pub-01-balanced-6-sites", "mix-pub-02-missing-plots"]) {
  describe(`stability matches R to 1e-9: ${caseName}`, () => {
    const expected = analysis(caseName, "stability");
    const result = stability(cellMeansOf(caseName));

    it("per entry: mean, Finlay-Wilkinson slope, its SE, deviation MS, Wricke's ecovalence, Shukla's variance", () => {
      expect(result.entries.map((e) => e.entry).sort()).toEqual(expected.entries.map((e: { entry: string }) => e.entry).sort());
      for (const r of expected.entries) {
        const ours = result.entries.find((e) => e.entry === r.entry)!;
        for (const [key, ref] of [["mean", r.mean], ["slope", r.slope], ["slopeSe", r.slope_se], ["deviationMs", r.deviation_ms], ["ecovalence", r.ecovalence], ["shuklaVariance", r.shukla_variance]] as const) {
          expect(close(ours[key], ref), `${r.entry} ${key}: ${ours[key]} vs R ${ref}`).toBe(true);
        }
      }
    });

    it("GGE: singular values and share explained of the table centred by environment", () => {
      expect(result.gge.singularValues).toHaveLength(expected.gge.singular_values.length);
      expected.gge.singular_values.forEach((d: number, k: number) => expect(close(result.gge.singularValues[k]!, d), `d${k + 1}`).toBe(true));
      expected.gge.explained.forEach((x: number, k: number) => expect(close(result.gge.explained[k]!, x), `explained ${k + 1}`).toBe(true));
    });

    it("GGE: entry and environment scores on components 1 and 2 (symmetric scaling), whatever the sign of each component", () => {
      for (const pc of ["pc1", "pc2"] as const) {
        const refs = [...expected.gge.entry_scores.map((r: { entry: string; pc1: number; pc2: number }) => ({ ours: result.gge.entryScores.find((e) => e.entry === r.entry)![pc], ref: r[pc] })),
          ...expected.gge.environment_scores.map((r: { environment: string; pc1: number; pc2: number }) => ({ ours: result.gge.environmentScores.find((e) => e.environment === r.environment)![pc], ref: r[pc] }))];
        // a component flips as a whole: one sign for all its entry and environment scores
        const sign = Math.sign(refs.reduce((s: number, x: { ours: number; ref: number }) => s + x.ours * x.ref, 0));
        for (const { ours, ref } of refs) expect(close(sign * ours, ref), `${pc}: ${sign * ours} vs R ${ref}`).toBe(true);
      }
    });
  });
}

describe("planTrial matches R to 1e-9 (mix-pub-01 planning rows)", () => {
  for (const plan of analysis("mix-pub-01-balanced-6-sites", "planning").plans) {
    it(`cv ${plan.cv}%, mean ${plan.mean}, difference ${plan.difference}, ${plan.entries} entries x ${plan.blocks} blocks x ${plan.sites} sites, alpha ${plan.alpha}`, () => {
      const ours = planTrial({ cv: plan.cv, mean: plan.mean, difference: plan.difference, entries: plan.entries, blocks: plan.blocks, sites: plan.sites, alpha: plan.alpha });
      expect(ours.errorDf).toBe(plan.error_df);
      for (const [key, ref] of [["seDifference", plan.se_difference], ["tCritical", plan.t_critical], ["power", plan.power], ["lsd", plan.lsd]] as const) {
        expect(close(ours[key], ref), `${key}: ${ours[key]} vs R ${ref}`).toBe(true);
      }
      expect(ours.blocksForPower80).toBe(plan.blocks_for_power_0_8);
    });
  }

  it("the fewest blocks for 80% power is null when no design up to 50 blocks reaches it", () => {
    expect(planTrial({ cv: 40, mean: 10, difference: 0.1, entries: 4, blocks: 3, sites: 1 }).blocksForPower80).toBeNull();
  });

  it("the noncentral t is the central t when the noncentrality is 0 and keeps P(T <= t) in order", () => {
    expect(Math.abs(noncentralTCdf(2.0, 10, 0) - 0.963305982614578)).toBeLessThan(1e-12); // R: pt(2, 10)
    expect(noncentralTCdf(1, 12, 2)).toBeLessThan(noncentralTCdf(2, 12, 2));
  });
});

describe("bad input to stability and planning throws the typed statistics error with a plain message", () => {
  const grid = (envs: string[], entries: string[]) => envs.flatMap((environment, j) => entries.map((entry, i) => ({ environment, entry, mean: 10 + i + 3 * j + (i * j) % 2 })));
  const throwsPlain = (run: () => unknown, code: string, words: RegExp) => {
    try {
      run();
    } catch (e) {
      expect(isStatsError(e, code as never), String(e)).toBe(true);
      expect((e as Error).message).toMatch(words);
      return;
    }
    throw new Error("expected a StatsError");
  };
  it("one or two sites are too few for stability", () => {
    throwsPlain(() => stability(grid(["A"], ["x", "y", "z"])), "TOO_FEW_GROUPS", /at least 3 sites \(there is 1\)/);
    throwsPlain(() => stability(grid(["A", "B"], ["x", "y", "z"])), "TOO_FEW_GROUPS", /at least 3 sites/);
  });
  it("two varieties are too few for stability", () => {
    throwsPlain(() => stability(grid(["A", "B", "C"], ["x", "y"])), "TOO_FEW_ENTRIES", /at least 3 varieties/);
  });
  it("a variety missing at a site is named with the site", () => {
    throwsPlain(() => stability(grid(["A", "B", "C"], ["x", "y", "z"]).filter((c) => !(c.entry === "y" && c.environment === "B"))), "EMPTY_TABLE_ROW", /y has no mean at B/);
  });
  it("a mean that is not a number is refused", () => {
    throwsPlain(() => stability(grid(["A", "B", "C"], ["x", "y", "z"]).map((c, i) => (i === 4 ? { ...c, mean: Number.NaN } : c))), "NON_FINITE_VALUE", /is not a number/);
  });
  it("two means for one variety at one site are refused", () => {
    const cells = grid(["A", "B", "C"], ["x", "y", "z"]);
    throwsPlain(() => stability([...cells, cells[0]!]), "TABLE_SHAPE", /more than one mean/);
  });
  it("sites that all have the same mean leave nothing to respond to", () => {
    const means: Record<string, number[]> = { A: [5, 6, 7], B: [7, 6, 5], C: [6, 6, 6] };
    throwsPlain(() => stability(Object.entries(means).flatMap(([environment, row]) => row.map((mean, i) => ({ environment, entry: ["x", "y", "z"][i]!, mean })))), "NO_VARIATION", /same mean/);
  });
  it("a CV of 0 or less, fewer than 2 entries or blocks, a difference that is not a number are refused", () => {
    const ok = { cv: 12, mean: 100, difference: 10, entries: 8, blocks: 3, sites: 2 };
    throwsPlain(() => planTrial({ ...ok, cv: 0 }), "INVALID_ARGUMENT", /CV must be a number above 0%/);
    throwsPlain(() => planTrial({ ...ok, cv: -5 }), "INVALID_ARGUMENT", /CV/);
    throwsPlain(() => planTrial({ ...ok, entries: 1 }), "INVALID_ARGUMENT", /at least 2 entries/);
    throwsPlain(() => planTrial({ ...ok, blocks: 1 }), "INVALID_ARGUMENT", /at least 2 blocks/);
    throwsPlain(() => planTrial({ ...ok, sites: 0 }), "INVALID_ARGUMENT", /at least 1 site/);
    throwsPlain(() => planTrial({ ...ok, difference: Number.NaN }), "NON_FINITE_VALUE", /difference worth detecting/);
    throwsPlain(() => planTrial({ ...ok, mean: Infinity }), "NON_FINITE_VALUE", /expected mean/);
    throwsPlain(() => planTrial({ ...ok, alpha: 1 }), "INVALID_PROBABILITY", /significance level/);
  });
});
