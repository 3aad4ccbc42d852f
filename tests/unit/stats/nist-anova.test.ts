// NIST StRD one-way ANOVA data sets (tests/fixtures/nist-strd-anova, certified values in
// certified.json): every data set must reach, for between/within SS and MS, F and R-squared, the
// LRE that exact arithmetic on the parsed doubles reaches (README table) minus 0.5.
import { describe, expect, it } from "vitest";
import { anovaOneWay } from "@/lib/domain/stats";
import { lre, readCsv, readJson } from "./fixtures";

const certified = readJson("nist-strd-anova/certified.json").datasets as Record<string, any>;

// "exact arithmetic on the parsed doubles" LRE of F per data set (nist-strd-anova/README.md)
const EXACT_ON_DOUBLES: Record<string, number> = {
  SiRstv: 13.1,
  SmLs01: 15,
  SmLs02: 15,
  SmLs03: 15,
  SmLs04: 10.4,
  SmLs05: 10.2,
  SmLs06: 10.2,
  SmLs07: 4.4,
  SmLs08: 4.2,
  SmLs09: 4.2,
  AtmWtAg: 10.2,
};

describe("NIST StRD ANOVA certified values", () => {
  for (const [name, c] of Object.entries(certified)) {
    it(`${name} (${c.difficulty} difficulty, ${c.observations} observations) reaches LRE >= ${EXACT_ON_DOUBLES[name] - 0.5}`, () => {
      const data = readCsv(`nist-strd-anova/${c.file}`).map((row) => ({ entry: row.group, value: Number(row.value) }));
      expect(data).toHaveLength(c.observations);
      const table = anovaOneWay(data);
      const [between, within] = table.rows;
      expect(between.df).toBe(c.between.df);
      expect(within.df).toBe(c.within.df);
      const scores = {
        betweenSs: lre(between.ss, c.between.ss),
        betweenMs: lre(between.ms, c.between.ms),
        f: lre(between.f!, c.between.F),
        withinSs: lre(within.ss, c.within.ss),
        withinMs: lre(within.ms, c.within.ms),
        rSquared: lre(table.rSquared!, c.r_squared),
        residualSd: lre(Math.sqrt(within.ms), c.residual_sd),
      };
      for (const [quantity, score] of Object.entries(scores)) {
        expect(score, `${name} ${quantity} LRE`).toBeGreaterThanOrEqual(EXACT_ON_DOUBLES[name] - 0.5);
      }
    });
  }

  it("SmLs09 gives F close to 2001 where jstat gives 14126 (NIST StRD SmLs09 certified F = 2001)", () => {
    const data = readCsv("nist-strd-anova/SmLs09.csv").map((row) => ({ entry: row.group, value: Number(row.value) }));
    expect(anovaOneWay(data).rows[0].f).toBeCloseTo(2001, 0);
  });
});
