// REML mixed-model reference results (tests/fixtures/r-mixed: lme4 1.1-31, lmerTest 3.1-3, emmeans
// 1.8.4-1, pbkrtest 0.5.2 under R 4.2.2; every expected number was produced by the `r_call` stored
// next to it). Tolerances are the README's: variance components and REML criterion relative 1e-6,
// means / differences / F relative 1e-7, SE 1e-6, Kenward-Roger df 1e-6, Satterthwaite df 1e-5
// (lmerTest differentiates numerically), p relative 1e-4. One reading: R's optimiser stops within
// about 5e-7 of the REML optimum (the balanced case shows it against the exact expected-mean-squares
// answer), so a difference or t near zero is compared on the scale of its standard error (resp. 1)
// instead of its own, tiny, magnitude.
import { describe, expect, it } from "vitest";
import { anovaMultiSite, isStatsError, mixedModel, StatsError, type MixedPlot } from "@/lib/domain/stats";
import { readCsv, readJson, relativeError } from "./fixtures";

const CASES = ["mix-pub-01-balanced-6-sites", "mix-pub-02-missing-plots", "mix-pub-03-multi-year-unbalanced"];

interface Analysis {
  id: string;
  [key: string]: any;
}

function readCase(name: string) {
  const rows = readCsv(`r-mixed/${name}.csv`).map((row) =>
    Object.fromEntries(Object.entries(row).map(([k, v]) => [k.replace(/"/g, ""), v.replace(/"/g, "")])),
  );
  // R's factor levels come from every row, missing plots included (r_read_input)
  const entries = [...new Set(rows.map((row) => row.entry))];
  const plots: MixedPlot[] = rows
    .filter((row) => row.value !== "" && row.value !== "NA")
    .map((row) => ({
      site: row.site,
      ...(row.year ? { year: row.year } : {}),
      block: row.block,
      entry: row.entry,
      value: Number(row.value),
    }));
  const json = readJson<{ analyses: Analysis[] }>(`r-mixed/${name}.json`);
  const analyses = Object.fromEntries(json.analyses.map((a) => [a.id, a]));
  return { plots, entries, analyses };
}

function expectRelative(actual: number, expected: number, tolerance: number, what: string, scale = Math.abs(expected)) {
  const error = Math.abs(actual - expected) / Math.max(scale, Math.abs(expected));
  if (!(error <= tolerance)) {
    throw new Error(`${what}: got ${actual}, R ${expected} (relative error ${error.toExponential(2)} > ${tolerance})`);
  }
}

describe.each(CASES)("mixed model matches lme4 / lmerTest / emmeans / pbkrtest: %s", (name) => {
  const { plots, entries, analyses } = readCase(name);

  for (const method of ["satterthwaite", "kenward-roger"] as const) {
    const key = method === "satterthwaite" ? "satterthwaite" : "kenward_roger";
    const dfTolerance = method === "satterthwaite" ? 1e-5 : 1e-6;
    const result = mixedModel(plots, { df: method, entries });

    it(`variance components and REML criterion (${method})`, () => {
      const expected = analyses.variance_components;
      const residual = expected.components.find((c: any) => c.term === "residual").variance;
      for (const component of expected.components) {
        const mine = result.components.find((c) => c.term === component.term);
        expect(mine, component.term).toBeDefined();
        if (component.variance < 1e-8 * residual) {
          expect(Math.abs(mine!.variance - component.variance)).toBeLessThanOrEqual(1e-8 * residual);
        } else {
          expectRelative(mine!.variance, component.variance, 1e-6, component.term);
        }
      }
      expectRelative(result.remlCriterion, expected.reml_criterion, 1e-6, "REML criterion");
      expect(result.singular).toBe(expected.singular);
      expect(result.n).toBe(expected.n);
    });

    it(`F test of entries (${method})`, () => {
      const expected = analyses[`entry_test_${key}`];
      expect(result.entryTest.numDf).toBe(expected.num_df);
      expectRelative(result.entryTest.denDf, expected.den_df, dfTolerance, "den df");
      expectRelative(result.entryTest.f, expected.f, 1e-7, "F");
      expectRelative(result.entryTest.p, expected.p, 1e-4, "p");
    });

    it(`estimated marginal means with SE and df (${method})`, () => {
      const expected = analyses[`entry_means_${key}`].means;
      expect(result.entryMeans.map((m) => m.entry)).toEqual(expected.map((m: any) => m.entry));
      for (const m of expected) {
        const mine = result.entryMeans.find((x) => x.entry === m.entry)!;
        expectRelative(mine.mean, m.mean, 1e-7, `${m.entry} mean`);
        expectRelative(mine.se, m.se, 1e-6, `${m.entry} SE`);
        expectRelative(mine.df, m.df, dfTolerance, `${m.entry} df`);
      }
    });

    it(`every pairwise difference with SE, df, t and p (${method})`, () => {
      const expected = analyses[`pairs_${key}`].pairs;
      expect(result.pairs).toHaveLength(expected.length);
      for (const pair of expected) {
        const mine = result.pairs.find((x) => x.a === pair.entry_1 && x.b === pair.entry_2);
        expect(mine, `${pair.entry_1} - ${pair.entry_2}`).toBeDefined();
        const label = `${pair.entry_1} - ${pair.entry_2}`;
        expectRelative(mine!.diff, pair.diff, 1e-7, `${label} diff`, pair.se);
        expectRelative(mine!.se, pair.se, 1e-6, `${label} SE`);
        expectRelative(mine!.df, pair.df, dfTolerance, `${label} df`);
        expectRelative(mine!.t, pair.t, 1e-7, `${label} t`, 1);
        expectRelative(mine!.p, pair.p, 1e-4, `${label} p`);
      }
    });
  }
});

describe("mixed model checks from within", () => {
  it("on balanced data the REML variances equal the expected-mean-squares estimates of the combined ANOVA", () => {
    const { plots } = readCase("mix-pub-01-balanced-6-sites");
    const table = anovaMultiSite(plots);
    const ms = Object.fromEntries(table.rows.map((row) => [row.source, row.ms]));
    const blocks = 3;
    const entries = 8;
    const expected: Record<string, number> = {
      residual: ms.residual,
      "entry:environment": (ms["entry:site"] - ms.residual) / blocks,
      "block:environment": (ms["block:site"] - ms.residual) / entries,
      environment: (ms.site - ms["block:site"] - ms["entry:site"] + ms.residual) / (blocks * entries),
    };
    const result = mixedModel(plots);
    for (const component of result.components) {
      expect(relativeError(component.variance, expected[component.term])).toBeLessThan(1e-8);
    }
  });

  it("a variance estimated at zero is reported as singular, not as an error", () => {
    // every block of a site holds the same five plot errors, shifted: block totals are equal within
    // each site, so the block variance has nothing to estimate and its REML estimate is zero
    const plots: MixedPlot[] = [];
    const siteEffect = [0, 8, -5, 3];
    const entryEffect = [0, 2, 5, -1, 3];
    const plotError = [0.9, -1.4, 0.5, 1.1, -0.6];
    siteEffect.forEach((s, si) => {
      for (let b = 0; b < 3; b++) {
        entryEffect.forEach((e, ei) => {
          const interaction = ((si * 7 + ei * 3) % 5) - 2;
          plots.push({
            site: `S${si + 1}`,
            block: String(b + 1),
            entry: `V${ei + 1}`,
            value: 50 + s + e + interaction + plotError[(ei + 2 * b + si) % 5],
          });
        });
      }
    });
    const result = mixedModel(plots);
    expect(result.singular).toBe(true);
    const residual = result.components.find((c) => c.term === "residual")!.variance;
    expect(result.components.find((c) => c.term === "block:environment")!.variance).toBeLessThan(1e-8 * residual);
    expect(result.entryMeans.every((m) => Number.isFinite(m.mean) && Number.isFinite(m.se))).toBe(true);
  });

  it("bad input throws the typed statistics error with a plain message", () => {
    const plots: MixedPlot[] = [
      { site: "A", block: "1", entry: "X", value: 1 },
      { site: "A", block: "1", entry: "Y", value: 2 },
      { site: "A", block: "2", entry: "X", value: 1.5 },
      { site: "A", block: "2", entry: "Y", value: 2.5 },
    ];
    const codeOf = (run: () => unknown) => {
      try {
        run();
      } catch (error) {
        expect(error).toBeInstanceOf(StatsError);
        expect((error as StatsError).message).toMatch(/[a-z]{3,} .+\./);
        return isStatsError(error) ? error.code : "other";
      }
      return "no error";
    };
    expect(codeOf(() => mixedModel(plots))).toBe("TOO_FEW_GROUPS");
    const twoSites = [...plots, ...plots.map((p) => ({ ...p, site: "B", value: p.value + 1 }))];
    expect(codeOf(() => mixedModel(twoSites, { entries: ["X", "Y", "Z"] }))).toBe("EMPTY_ENTRY");
    expect(codeOf(() => mixedModel([...twoSites, { site: "B", block: "3", entry: "X", value: Number.NaN }]))).toBe(
      "NON_FINITE_VALUE",
    );
    expect(codeOf(() => mixedModel([...twoSites, { site: "B", block: "3", entry: "X", value: Infinity }]))).toBe(
      "NON_FINITE_VALUE",
    );
  });
});
