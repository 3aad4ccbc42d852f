// Base-R reference results (tests/fixtures/r-checks, R 4.2.2; every expected number was produced
// by the `r_call` stored next to it). ANOVA rows, LSD, Tukey, LS means, random-site tests and
// Bartlett's test are compared to relative 1e-9. Exceptions, both from R's own accuracy
// (r-checks/README.md "Tolerances"): Tukey intervals use R's qtukey, which stops iterating at
// 1e-4 (measured here: within 1e-7 relative of the true quantile), so half-widths are compared to
// relative 1e-6; p_adj comes from R's ptukey and is compared to absolute 1e-8.
import { describe, expect, it } from "vitest";
import {
  anovaMultiSite,
  anovaOneWay,
  anovaRcbd,
  bartlett,
  bartlettFromVariances,
  lsd,
  pairwiseLsd,
  studentizedRangeQuantile,
  tukeyHsd,
  type AnovaTable,
} from "@/lib/domain/stats";
import { readJson, readPlots, relativeError } from "./fixtures";

const REL = 1e-9;
const SOURCE_OF_TERM: Record<string, string> = {
  site: "site",
  block: "block",
  site_block: "block:site",
  entry: "entry",
  "site:entry": "entry:site",
  Residuals: "residual",
};

function close(actual: number | null | undefined, expected: number, label: string, tolerance = REL): void {
  expect(actual, label).not.toBeNull();
  expect(relativeError(actual as number, expected), `${label}: ${actual} vs R ${expected}`).toBeLessThanOrEqual(tolerance);
}

function analysis(caseName: string, id: string): any {
  const found = readJson(`r-checks/${caseName}.json`).analyses.find((a: any) => a.id === id);
  if (!found) throw new Error(`no analysis ${id} in ${caseName}`);
  return found;
}

/** Every row of an R anova_table: df exact, SS / MS / F / p to REL (F and p against the residual). */
function expectAnovaTable(table: AnovaTable, expected: any, fixedSites = true): void {
  expect(table.rows.map((r) => r.source)).toEqual(expected.rows.map((r: any) => SOURCE_OF_TERM[r.term]));
  expected.rows.forEach((r: any, i: number) => {
    const row = table.rows[i];
    expect(row.df, `${r.term} df`).toBe(r.df);
    close(row.ss, r.ss, `${r.term} SS`);
    close(row.ms, r.ms, `${r.term} MS`);
    if (r.F === null) {
      expect(row.f).toBeNull();
      expect(row.p).toBeNull();
    } else if (fixedSites || row.testedAgainst === "residual") {
      expect(row.testedAgainst).toBe("residual");
      close(row.f, r.F, `${r.term} F`);
      close(row.p, r.p, `${r.term} p`);
    }
  });
  expect(table.n).toBe(expected.n_obs);
  expect(table.errorDf).toBe(expected.error_df);
  close(table.errorMs, expected.error_ms, "error MS");
  close(table.grandMean, expected.grand_mean, "grand mean");
  close(table.cv, expected.cv_percent, "CV%");
  close(table.rSquared, expected.r_squared, "R-squared");
}

function expectLsd(table: AnovaTable, expected: any): void {
  const all = pairwiseLsd(table);
  expect(all.df).toBe(expected.df);
  close(all.ms, expected.ms, "LSD MS");
  close(all.t, expected.t_crit, "t critical");
  expect(all.pairs).toHaveLength(expected.pairs.length);
  expected.pairs.forEach((p: any, i: number) => {
    const pair = all.pairs[i];
    expect([pair.a, pair.b]).toEqual([p.entry_1, p.entry_2]);
    close(pair.diff, p.diff, `${p.entry_1}-${p.entry_2} diff`);
    close(pair.sed, p.sed, `${p.entry_1}-${p.entry_2} SED`);
    close(pair.lsd, p.lsd, `${p.entry_1}-${p.entry_2} LSD`);
    close(pair.t, p.t, `${p.entry_1}-${p.entry_2} t`);
    close(pair.p, p.p_unadjusted, `${p.entry_1}-${p.entry_2} p`);
    expect(pair.significant).toBe(p.significant);
  });
  expect(all.letters).toEqual(expected.letters);
  const protectedLsd = lsd(table);
  if (expected.protected_test_passed) {
    expect(protectedLsd).not.toBeNull();
    close(protectedLsd!.lsd, expected.lsd_0_05, "LSD(0.05)");
    expect(protectedLsd!.df).toBe(expected.df);
    close(protectedLsd!.t, expected.t_crit, "LSD t");
  } else {
    expect(protectedLsd).toBeNull();
  }
}

function expectTukey(table: AnovaTable, expected: any): void {
  const result = tukeyHsd(table);
  expect(result.df).toBe(expected.df);
  close(result.ms, expected.ms, "Tukey MS");
  // R's qtukey stops its secant iteration at 1e-4 (README); ours is solved to ~1e-13
  expect(Math.abs(result.q - expected.q_crit)).toBeLessThan(1e-4);
  expected.pairs.forEach((p: any, i: number) => {
    const pair = result.pairs[i];
    expect([pair.a, pair.b]).toEqual([p.entry_1, p.entry_2]);
    close(pair.diff, p.diff, `${p.entry_1}-${p.entry_2} diff`, 1e-9 * Math.max(1, Math.abs(expected.hsd_0_05 / p.diff)));
    // the half-width q * SE differs from R's only through R's qtukey
    close(pair.upper - pair.diff, p.upr - p.diff, `${p.entry_1}-${p.entry_2} upper half-width`, 1e-6);
    close(pair.diff - pair.lower, p.diff - p.lwr, `${p.entry_1}-${p.entry_2} lower half-width`, 1e-6);
    expect(Math.abs(pair.pAdj - p.p_adj), `${p.entry_1}-${p.entry_2} p adj`).toBeLessThan(1e-8);
  });
  expect(result.letters).toEqual(expected.letters);
}

describe("R 4.2.2 pub-01 PlantGrowth one-way (Dobson 1983)", () => {
  const table = anovaOneWay(readPlots("pub-01-plantgrowth-oneway"));
  it("anova(lm(value ~ entry)) rows", () => expectAnovaTable(table, analysis("pub-01-plantgrowth-oneway", "anova")));
  it("protected LSD, pairwise t tests and letters", () => expectLsd(table, analysis("pub-01-plantgrowth-oneway", "lsd")));
  it("TukeyHSD pairs and letters", () => expectTukey(table, analysis("pub-01-plantgrowth-oneway", "tukey")));
  it("bartlett.test(value ~ entry)", () => {
    const expected = analysis("pub-01-plantgrowth-oneway", "bartlett_entries");
    const plots = readPlots("pub-01-plantgrowth-oneway");
    const groups = [...new Set(plots.map((p) => p.entry))].map((e) => plots.filter((p) => p.entry === e).map((p) => p.value!));
    const result = bartlett(groups);
    close(result.statistic, expected.K2, "K2");
    expect(result.df).toBe(expected.df);
    close(result.p, expected.p, "p");
  });
  it("entry means equal R's tapply means", () => {
    const expected = analysis("pub-01-plantgrowth-oneway", "lsd").means;
    expected.forEach((m: any, i: number) => {
      expect(table.entryMeans[i].entry).toBe(m.entry);
      expect(table.entryMeans[i].n).toBe(m.n);
      close(table.entryMeans[i].mean, m.mean, `${m.entry} mean`);
    });
  });
});

describe("R 4.2.2 pub-02 warpbreaks two-way factorial (Tippett 1950), wool in the site column, fixed", () => {
  const plots = readPlots("pub-02-warpbreaks-twoway");
  const table = anovaMultiSite(plots, { sites: "fixed" });
  it("anova(lm(value ~ site * entry)) rows (no blocks: the block row has 0 df and is left out)", () =>
    expectAnovaTable(table, analysis("pub-02-warpbreaks-twoway", "anova")));
  it("LSD on the residual MS", () => expectLsd(table, analysis("pub-02-warpbreaks-twoway", "lsd_entry")));
  it("TukeyHSD on entry", () => expectTukey(table, analysis("pub-02-warpbreaks-twoway", "tukey_entry")));
  it("bartlett.test across the site x entry cells", () => {
    const expected = analysis("pub-02-warpbreaks-twoway", "bartlett_cells");
    const cells = new Map<string, number[]>();
    for (const p of plots) cells.set(`${p.site}.${p.entry}`, [...(cells.get(`${p.site}.${p.entry}`) ?? []), p.value!]);
    const result = bartlett([...cells.values()]);
    close(result.statistic, expected.K2, "K2");
    expect(result.df).toBe(expected.df);
    close(result.p, expected.p, "p");
  });
});

describe("R 4.2.2 pub-03 OrchardSprays RCBD (Finney 1947)", () => {
  const table = anovaRcbd(readPlots("pub-03-orchardsprays-rcbd"));
  it("anova(lm(value ~ block + entry)) rows, entry p = 1.03e-12 to relative 1e-9", () =>
    expectAnovaTable(table, analysis("pub-03-orchardsprays-rcbd", "anova")));
  it("LSD", () => expectLsd(table, analysis("pub-03-orchardsprays-rcbd", "lsd")));
  it("TukeyHSD on OrchardSprays", () => expectTukey(table, analysis("pub-03-orchardsprays-rcbd", "tukey")));
});

describe("R 4.2.2 pub-04 npk incomplete blocks (Yates 1935): aliasing", () => {
  const table = anovaRcbd(readPlots("pub-04-npk-incomplete-blocks"));
  it("sequential SS block first: entry keeps 6 df, not 7", () =>
    expectAnovaTable(table, analysis("pub-04-npk-incomplete-blocks", "anova_type1_block_first")));
  it("entry SS after blocks equals drop1's adjusted SS", () => {
    const adjusted = analysis("pub-04-npk-incomplete-blocks", "adjusted_ss").rows.find((r: any) => r.term === "entry");
    const entry = table.rows.find((r) => r.source === "entry")!;
    expect(entry.df).toBe(adjusted.df);
    close(entry.ss, adjusted.adjusted_ss, "adjusted entry SS");
    close(entry.f, adjusted.F, "adjusted F");
  });
  it("LS means are not estimable, so comparisons refuse with a typed error", () => {
    expect(table.lsMeans).toBeNull();
    expect(() => tukeyHsd(table)).toThrow(expect.objectContaining({ code: "NOT_ESTIMABLE" }));
  });
});

describe("R 4.2.2 pub-05 multi-site balanced yield (constructed, set.seed(20250611))", () => {
  const caseName = "pub-05-multisite-yield-balanced";
  const plots = readPlots(caseName);
  const random = anovaMultiSite(plots);
  const fixed = anovaMultiSite(plots, { sites: "fixed" });
  const combined = analysis(caseName, "combined_anova");
  it("combined anova(lm(value ~ site + site_block + entry + site:entry)) rows, sites fixed", () =>
    expectAnovaTable(fixed, combined));
  it("random sites: entry tested against entry x site, site against block within site", () => {
    const tests = combined.random_site_tests;
    const byName = (source: string) => random.rows.find((r) => r.source === source)!;
    expect(byName("entry").testedAgainst).toBe("entry:site");
    close(byName("entry").f, tests.entry_vs_entry_x_site.F, "entry F");
    close(byName("entry").p, tests.entry_vs_entry_x_site.p, "entry p");
    expect(byName("site").testedAgainst).toBe("block:site");
    close(byName("site").f, tests.site_vs_block_within_site.F, "site F");
    close(byName("site").p, tests.site_vs_block_within_site.p, "site p");
    close(byName("entry:site").f, tests.entry_x_site_vs_residual.F, "entry x site F");
    close(byName("block:site").p, tests.block_within_site_vs_residual.p, "block within site p");
    expectAnovaTable(random, combined, false);
  });
  it("LSD and Tukey with random sites use the entry x site MS and df", () => {
    expectLsd(random, analysis(caseName, "combined_lsd_entry_random_sites"));
    expectTukey(random, analysis(caseName, "combined_tukey_entry_random_sites"));
  });
  it("LSD and Tukey with fixed sites use the residual MS", () => {
    expectLsd(fixed, analysis(caseName, "combined_lsd_entry_fixed_sites"));
    expectTukey(fixed, analysis(caseName, "combined_tukey_entry_fixed_sites"));
  });
  for (const site of ["S1", "S2", "S3", "S4"]) {
    it(`site ${site} RCBD table, LSD and Tukey`, () => {
      const table = anovaRcbd(plots.filter((p) => p.site === site));
      expectAnovaTable(table, analysis(caseName, `site_${site}_anova`));
      expectLsd(table, analysis(caseName, `site_${site}_lsd`));
      expectTukey(table, analysis(caseName, `site_${site}_tukey`));
    });
  }
  it("bartlett.test of the per-site error variances", () => {
    const expected = analysis(caseName, "bartlett_sites");
    random.siteErrors!.forEach((s, i) => {
      expect(s.df).toBe(expected.site_error_variances[i].error_df);
      close(s.ms, expected.site_error_variances[i].error_ms, `${s.site} error MS`);
    });
    const result = bartlettFromVariances(random.siteErrors!.map((s) => ({ df: s.df, variance: s.ms })));
    close(result.statistic, expected.K2, "K2");
    close(result.p, expected.p, "p");
    close(result.pooledVariance, expected.pooled_error_ms, "pooled MS");
  });
  it("entry means", () => {
    analysis(caseName, "means").entry_means.forEach((m: any, i: number) => close(random.entryMeans[i].mean, m.mean, m.entry));
  });
});

describe("R 4.2.2 pub-06 multi-site with 2 missing plots (constructed, set.seed(20250612))", () => {
  const caseName = "pub-06-multisite-maturity-missing";
  const plots = readPlots(caseName);
  const site2 = anovaRcbd(plots.filter((p) => p.site === "S2"));
  it("site S2: sequential SS with entry after blocks, by least squares", () => {
    expectAnovaTable(site2, analysis(caseName, "site_S2_anova_type1_block_first"));
    expect(site2.missing).toBe(2);
  });
  it("site S2: missing plots given as absent rows give the same table", () => {
    const dropped = anovaRcbd(plots.filter((p) => p.site === "S2" && p.value !== null));
    expectAnovaTable(dropped, analysis(caseName, "site_S2_anova_type1_block_first"));
    expect(dropped.missing).toBe(2);
  });
  it("site S2: entry SS equals drop1's adjusted SS", () => {
    const adjusted = analysis(caseName, "site_S2_adjusted_ss").rows.find((r: any) => r.term === "entry");
    close(site2.rows.find((r) => r.source === "entry")!.ss, adjusted.adjusted_ss, "adjusted SS");
  });
  it("site S2: LS means, SEs, exact pairwise SED / LSD / p, Tukey-Kramer p and letters", () => {
    const expected = analysis(caseName, "site_S2_ls_means");
    expected.ls_means.forEach((m: any, i: number) => {
      expect(site2.lsMeans![i].entry).toBe(m.entry);
      close(site2.lsMeans![i].mean, m.ls_mean, `${m.entry} LS mean`);
      close(site2.lsMeans![i].se, m.se, `${m.entry} SE`);
    });
    const lsdPairs = pairwiseLsd(site2);
    close(lsdPairs.t, expected.t_crit, "t critical");
    const tukey = tukeyHsd(site2);
    expected.pairs.forEach((p: any, i: number) => {
      const pair = lsdPairs.pairs[i];
      expect([pair.a, pair.b]).toEqual([p.entry_1, p.entry_2]);
      close(pair.diff, p.diff, "diff", 1e-9 * Math.max(1, Math.abs(expected.mean_sed / p.diff)));
      close(pair.sed, p.sed, "SED");
      close(pair.lsd, p.lsd_0_05, "pair LSD");
      close(pair.p, p.p_unadjusted, "p", 1e-9 * Math.max(1, Math.abs(1 / p.t)));
      expect(Math.abs(tukey.pairs[i].pAdj - p.p_tukey)).toBeLessThan(1e-8);
    });
    close(lsd(site2)!.lsd, expected.mean_lsd_0_05, "mean LSD");
    expect(lsdPairs.letters).toEqual(expected.letters_lsd);
    expect(tukey.letters).toEqual(expected.letters_tukey);
  });
  it("combined sequential table (site, block within site, entry, entry x site), fixed sites", () => {
    const table = anovaMultiSite(plots, { sites: "fixed" });
    expectAnovaTable(table, analysis(caseName, "combined_anova"));
    expect(table.missing).toBe(2);
  });
  it("combined random-site ratios of the sequential mean squares", () => {
    const tests = analysis(caseName, "combined_anova").random_site_tests;
    const table = anovaMultiSite(plots);
    const entry = table.rows.find((r) => r.source === "entry")!;
    const site = table.rows.find((r) => r.source === "site")!;
    close(entry.f, tests.entry_vs_entry_x_site.F, "entry F");
    close(entry.p, tests.entry_vs_entry_x_site.p, "entry p");
    close(site.f, tests.site_vs_block_within_site.F, "site F");
    close(site.p, tests.site_vs_block_within_site.p, "site p");
  });
  it("per-site error variances and Bartlett's test", () => {
    const expected = analysis(caseName, "bartlett_sites");
    const table = anovaMultiSite(plots);
    const result = bartlettFromVariances(table.siteErrors!.map((s) => ({ df: s.df, variance: s.ms })));
    close(result.statistic, expected.K2, "K2");
    expect(result.df).toBe(expected.df);
    close(result.p, expected.p, "p");
  });
  for (const site of ["S1", "S3"]) {
    it(`balanced site ${site}: table, LSD and Tukey`, () => {
      const table = anovaRcbd(plots.filter((p) => p.site === site));
      expectAnovaTable(table, analysis(caseName, `site_${site}_anova`));
      expectLsd(table, analysis(caseName, `site_${site}_lsd`));
      expectTukey(table, analysis(caseName, `site_${site}_tukey`));
    });
  }
});

describe("studentized range quantile against R's qtukey calls in the r-checks", () => {
  it("pub-03 qtukey(0.95, nmeans = 8, df = 49) within R's stated 1e-4", () => {
    expect(Math.abs(studentizedRangeQuantile(0.95, 8, 49) - analysis("pub-03-orchardsprays-rcbd", "tukey").q_crit)).toBeLessThan(1e-4);
  });
});
