// Base-R chisq.test and mantelhaen.test results (tests/fixtures/r-checks pub-07 and pub-08,
// R 4.2.2), compared to relative 1e-9, p-values included (down to 1e-21).
import { describe, expect, it } from "vitest";
import {
  chiSquareGoodnessOfFit,
  chiSquareIndependence,
  cochranMantelHaenszel,
  germinationByEntry,
  germinationHomogeneity,
  germinationHomogeneityBySite,
  germinationVersusLabel,
} from "@/lib/domain/stats";
import { readCsv, readJson, relativeError } from "./fixtures";

function close(actual: number | undefined, expected: number, label: string, tolerance = 1e-9): void {
  expect(relativeError(actual as number, expected), `${label}: ${actual} vs R ${expected}`).toBeLessThanOrEqual(tolerance);
}

function germinationPlots(caseName: string) {
  return readCsv(`r-checks/${caseName}.csv`).map((r) => ({ entry: r.entry, site: r.site, sown: Number(r.sown), emerged: Number(r.emerged) }));
}

function expectChisq(result: { statistic: number; df: number; p: number }, expected: any, label: string) {
  close(result.statistic, expected.statistic, `${label} statistic`);
  expect(result.df).toBe(expected.df);
  close(result.p, expected.p, `${label} p`);
}

describe("R 4.2.2 pub-07 germination 6 entries x 4 sites (constructed, set.seed(20250613))", () => {
  const json = readJson("r-checks/pub-07-germination-6x4.json");
  const plots = germinationPlots("pub-07-germination-6x4");
  const byId = (id: string) => json.analyses.find((a: any) => a.id === id);

  it("pooled germination % per entry", () => {
    const pooled = germinationByEntry(plots);
    byId("table").pooled.forEach((row: any, i: number) => {
      expect(pooled[i]).toMatchObject({ entry: row.entry, sown: row.sown, emerged: row.emerged });
      close(pooled[i].percent, row.percent, `${row.entry} percent`);
    });
  });

  it("chisq.test goodness of fit to the labelled rate, pooled and per site (30 calls)", () => {
    const rates = json.labelled_rates as Record<string, number>;
    const gofs = json.analyses.filter((a: any) => a.kind === "chisq" && a.id.startsWith("gof_"));
    expect(gofs).toHaveLength(30);
    for (const gof of gofs) {
      const observed = [gof.observed.emerged, gof.observed.not_emerged];
      const direct = chiSquareGoodnessOfFit(observed, [rates[gof.entry], 1 - rates[gof.entry]]);
      expectChisq(direct, gof, gof.id);
      close(direct.expected[0], gof.expected.emerged, `${gof.id} expected`);
      const viaLabel = germinationVersusLabel(observed[0], observed[0] + observed[1], 100 * rates[gof.entry])!;
      expectChisq(viaLabel, gof, `${gof.id} via label`);
    }
  });

  it("chisq.test homogeneity across entries, pooled and per site, with expected counts", () => {
    const pooled = germinationHomogeneity(plots);
    expectChisq(pooled, byId("homogeneity_pooled"), "pooled");
    byId("homogeneity_pooled").expected.forEach((row: any, i: number) => close(pooled.expected[i][0], row.emerged, "expected"));
    for (const site of ["S1", "S2", "S3", "S4"]) {
      const expected = byId(`homogeneity_site_${site}`);
      const table = expected.observed.map((row: any) => [row.emerged, row.not_emerged]);
      expectChisq(chiSquareIndependence(table), expected, site);
      expectChisq(germinationHomogeneity(plots.filter((p) => p.site === site)), expected, `${site} plots`);
    }
  });

  it("mantelhaen.test generalized CMH across the four sites (df 5)", () => {
    expectChisq(germinationHomogeneityBySite(plots), byId("cmh"), "CMH");
  });

  it("E1 vs E4: 2 x 2 with and without Yates, MH with and without correction, common odds ratio", () => {
    const pair = plots.filter((p) => p.entry === "E1" || p.entry === "E4");
    expectChisq(germinationHomogeneity(pair), byId("pair_homogeneity_yates"), "Yates");
    expectChisq(germinationHomogeneity(pair, { correct: false }), byId("pair_homogeneity_no_yates"), "no Yates");
    const corrected = germinationHomogeneityBySite(pair);
    expectChisq(corrected, byId("pair_cmh"), "MH corrected");
    close(corrected.commonOddsRatio, byId("pair_cmh").common_odds_ratio, "odds ratio");
    close(corrected.oddsRatioCi95![0], byId("pair_cmh").odds_ratio_ci_95[0], "CI lower");
    close(corrected.oddsRatioCi95![1], byId("pair_cmh").odds_ratio_ci_95[1], "CI upper");
    expectChisq(germinationHomogeneityBySite(pair, { correct: false }), byId("pair_cmh_no_correction"), "MH uncorrected");
  });
});

describe("R 4.2.2 pub-08 UCBAdmissions 2 x 2 x 6 (Bickel et al. 1975)", () => {
  const json = readJson("r-checks/pub-08-ucbadmissions-cmh.json");
  const byId = (id: string) => json.analyses.find((a: any) => a.id === id);
  const plots = germinationPlots("pub-08-ucbadmissions-cmh");
  const strata = ["A", "B", "C", "D", "E", "F"].map((site) =>
    ["Male", "Female"].map((entry) => {
      const p = plots.find((x) => x.site === site && x.entry === entry)!;
      return [p.emerged, p.sown - p.emerged];
    }),
  );

  it("pooled 2 x 2 with Yates (p = 1.06e-21) and without (p = 7.8e-22)", () => {
    const pooled = [0, 1].map((i) => [0, 1].map((j) => strata.reduce((sum, s) => sum + s[i][j], 0)));
    expectChisq(chiSquareIndependence(pooled), byId("homogeneity_pooled"), "Yates");
    expectChisq(chiSquareIndependence(pooled, { correct: false }), byId("homogeneity_pooled_no_yates"), "no Yates");
    const result = chiSquareIndependence(pooled);
    byId("homogeneity_pooled").expected.forEach((row: any, i: number) => {
      close(result.expected[i][0], row.emerged, "expected emerged");
      close(result.expected[i][1], row.not_emerged, "expected not emerged");
    });
  });

  it("per-department 2 x 2 tests with Yates' correction", () => {
    ["A", "B", "C", "D", "E", "F"].forEach((site, k) => expectChisq(chiSquareIndependence(strata[k]), byId(`homogeneity_site_${site}`), site));
  });

  it("Mantel-Haenszel across departments is not significant; odds ratio and 95% interval", () => {
    const corrected = cochranMantelHaenszel(strata);
    expectChisq(corrected, byId("cmh"), "MH");
    close(corrected.commonOddsRatio, byId("cmh").common_odds_ratio, "odds ratio");
    close(corrected.oddsRatioCi95![0], byId("cmh").odds_ratio_ci_95[0], "CI lower");
    close(corrected.oddsRatioCi95![1], byId("cmh").odds_ratio_ci_95[1], "CI upper");
    expectChisq(cochranMantelHaenszel(strata, { correct: false }), byId("cmh_no_correction"), "MH uncorrected");
  });
});
