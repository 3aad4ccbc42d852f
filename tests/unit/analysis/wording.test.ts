import { describe, expect, it } from "vitest";
import { runAnalysis, sitesDifferedWords } from "@/lib/domain/analysis/run";
import { analysedAs } from "@/lib/domain/analysis/values";
import { differenceWithUnit, valueWithUnit } from "@/lib/domain/analysis/format";
import { compareWithCheck, noPairDiffers } from "@/lib/domain/analysis/ranking";
import { exportTables } from "@/lib/domain/analysis/export";
import { summariseForGrowers } from "@/lib/domain/publish/summary";
import { describeCorrections } from "@/lib/domain/observations/corrections";
import { ANOVA_SOURCE_LABELS, formatDate, formatDateTime } from "@/lib/domain/vocabulary/labels";
import type { AnalysisInput, AnalysisSettings, InputTrait } from "@/lib/domain/analysis/types";

const YIELD: InputTrait = { id: 1, code: "marketable_yield", name: "Marketable yield", unit: "g per plot", valueType: "number", computation: "none", betterWhen: "higher" };
const QUALITY: InputTrait = { id: 1, code: "quality", name: "Overall quality", unit: "1-9", valueType: "rating", computation: "none", betterWhen: "higher" };
const BOLTING: InputTrait = { id: 1, code: "bolting", name: "Bolting at harvest", unit: "yes/no", valueType: "yes_no", computation: "none", betterWhen: "lower" };

/**
 * Invented trial: ten entries in two groups (every other entry `step` above, the rest `step` below), two
 * sites of four blocks, and seeded noise. Such a spread gives the F test its most power for the largest
 * pair difference, so a moderate step is significant by F while Tukey's test separates no pair.
 */
function invented(trait: InputTrait, step: number, value?: (effect: number, noise: number) => number, status: AnalysisInput["trial"]["status"] = "analysing"): AnalysisInput {
  const entries = Array.from({ length: 10 }, (_, i) => ({ id: i + 1, blindCode: `K${i}`, entryNumber: i + 1, varietyName: `Invented ${i}`, varietyId: i + 1, isCheck: i === 0, labelGermination: null, seedLot: null }));
  const sites = [1, 2].map((id) => ({ id, name: `Site ${id}`, sownOn: "2026-04-01", transplantedOn: null, status: "accepted" as const }));
  let seed = 7;
  const noise = () => {
    let t = 0;
    for (let k = 0; k < 6; k++) {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      t += seed / 2147483648;
    }
    return t - 3;
  };
  const plots: AnalysisInput["plots"] = [];
  const observations: AnalysisInput["observations"] = [];
  for (const site of sites) for (let block = 1; block <= 4; block++) for (const entry of entries) {
    const id = plots.length + 1;
    plots.push({ id, plotCode: `${site.id}-${block}-${entry.id}`, siteId: site.id, entryId: entry.id, block });
    const effect = entry.id % 2 ? step : -step;
    const v = value ? value(effect, noise()) : 50 + effect + 3 * noise();
    observations.push({ plotId: id, traitId: 1, occasion: 0, valueNumber: v, valueDate: null, missingReason: null });
  }
  return { trial: { id: 1, code: "INV-W", title: "Invented", crop: "Lettuce", blocks: 4, status }, traits: [trait], entries, sites, plots, observations, exclusions: [] };
}
const settings = (over: Partial<AnalysisSettings> = {}): AnalysisSettings => ({ traitId: 1, siteIds: null, includeUnaccepted: false, siteModel: "fixed", separation: "lsd", ...over });

describe("wording and formats people read", () => {
  it("writes values with their unit as people write them, never a raw unit code after a number", () => {
    expect(valueWithUnit(QUALITY, 6.875)).toBe("6.9 on the 1-9 scale");
    expect(valueWithUnit(YIELD, 2812.04)).toBe("2,812 g per plot");
    expect(valueWithUnit({ unit: "date", valueType: "date", computation: "days_from_sowing" }, 23.84)).toBe("23.8 days");
    expect(valueWithUnit(BOLTING, 0.4)).toBe("40% yes");
    // a least-squares share just below 0 (plots missing) is not told as a negative share
    expect(valueWithUnit(BOLTING, -0.02)).toBe("0% yes");
    expect(differenceWithUnit(BOLTING, 0.09)).toBe("9 percentage points");
    expect(differenceWithUnit(QUALITY, 0.45)).toBe("0.45 points on the 1-9 scale");
    const quality = runAnalysis(invented(QUALITY, 2, (effect, n) => Math.min(9, Math.max(1, Math.round(5 + effect + n)))), settings());
    const text = [...quality.notes, quality.combined!.comparisonNote].join(" ");
    expect(text).not.toMatch(/\d 1-9/);
    expect(text).toMatch(/on the 1-9 scale/);
    const yields = runAnalysis(invented(YIELD, 400, (effect, n) => 2800 + effect + 150 * n), settings());
    expect(yields.notes.join(" ")).not.toMatch(/\d\.\d g per plot/);
  });

  it("gives no % of check when the check's mean is not above 0, rather than a percentage of nothing", () => {
    const means = [
      { mean: 0, lsMean: -0.02, isCheck: true },
      { mean: 0.33, lsMean: 0.33, isCheck: false },
    ];
    expect(compareWithCheck(means, 0.03).map((c) => c.percentOfCheck)).toEqual([null, null]);
    expect(compareWithCheck(means, 0.03)[1]!.checkDifference).toBeCloseTo(0.35, 10);
    expect(compareWithCheck([{ mean: 0.1, lsMean: null, isCheck: true }, { mean: 0.2, lsMean: null, isCheck: false }], null)[1]!.percentOfCheck).toBeCloseTo(200, 10);
  });

  it("does not repeat a unit the trait's name already says", () => {
    const seedlings: InputTrait = { id: 4, code: "emerged_final", name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count", computation: "none", betterWhen: "higher" };
    expect(analysedAs(seedlings)).toBe("Seedlings emerged (final)");
    expect(analysedAs(YIELD)).toBe("Marketable yield (g per plot)");
    expect(analysedAs(QUALITY)).toBe("Overall quality (1-9)");
  });

  it("tells how many sites' tests found a difference in a sentence that reads naturally for one site, none, some and all", () => {
    expect(sitesDifferedWords("yield", 0, 1)).toBe("At the one site analysed, varieties did not differ clearly in yield");
    expect(sitesDifferedWords("yield", 1, 1)).toBe("At the one site analysed, varieties differed in yield");
    expect(sitesDifferedWords("yield", 0, 5)).toBe("Varieties did not differ clearly in yield at any of the 5 sites");
    expect(sitesDifferedWords("yield", 3, 5)).toBe("Varieties differed in yield at 3 of 5 sites");
    expect(sitesDifferedWords("yield", 2, 2)).toBe("Varieties differed in yield at both sites");
    expect(sitesDifferedWords("yield", 0, 2)).toBe("Varieties did not differ clearly in yield at either site");
    const oneSite = runAnalysis(invented(YIELD, 0), settings({ siteIds: [1] }));
    expect(oneSite.notes.join(" ")).not.toMatch(/\b0 of\b|of 1 site/);
  });

  it("says so when the F test is significant but Tukey's test finds no pair that differs", () => {
    const r = runAnalysis(invented(YIELD, 1.3), settings({ separation: "tukey" }));
    // the invented data do what the rule is about: a significant F and one letter shared by every entry
    expect(r.combined!.entryP!).toBeLessThan(0.05);
    expect(noPairDiffers(r.combined!.means)).toBe(true);
    expect(r.combined!.comparisonNote).toBe("Tukey found no pair that differs at α = 0.05.");
    const notes = r.notes.join(" ");
    expect(notes).toMatch(/the F test was significant \(F = [\d.]+, p = 0\.0\d\d; .*\), but Tukey's test found no pair of varieties that differs at α = 0\.05/);
    expect(notes).not.toMatch(/varieties differed \(F|Best combined mean/);
    expect(summariseForGrowers([r]).join(" ")).toMatch(/Tukey's test found no pair that clearly differs; treat the order as a tie/);
  });

  it("gives a yes/no trait no CV anywhere, and its share of yes instead", () => {
    const r = runAnalysis(invented(BOLTING, 0.2, (effect, n) => (0.3 + effect / 2 + n / 4 > 0.5 ? 1 : 0)), settings());
    expect(r.combined!.cv).toBeNull();
    expect(r.perSite.every((s) => s.result!.cv === null)).toBe(true);
    expect([...r.notes, ...r.warnings].join(" ")).not.toMatch(/\bCV\b/);
    expect(r.explanations.cv).toMatch(/^A yes\/no trait has no CV/);
    expect(r.notes.join(" ")).toMatch(/\d+% yes/);
    expect(exportTables(r, "2026-05-03", true).find((t) => t.name === "Means")!.rows.every((row) => row.at(-1) === null)).toBe(true);
  });

  it("shows every date in one format, May 3, 2026, whatever form it was stored in", () => {
    expect(formatDate("2026-05-03")).toBe("May 3, 2026");
    expect(formatDate("2026-05-03T22:30:00.000Z")).toBe("May 3, 2026");
    expect(formatDate(new Date("2026-05-03T23:59:00Z"))).toBe("May 3, 2026");
    expect(formatDate(null)).toBe("—");
    expect(formatDateTime(new Date("2026-05-03T14:05:09Z"))).toBe("May 3, 2026, 14:05 UTC");
    expect(formatDateTime("2026-12-01T08:00:00.000Z")).toBe("Dec 1, 2026, 08:00 UTC");
  });

  it("names the rows of an analysis of variance from one vocabulary in exports (the page and the PDF read the same)", () => {
    const r = runAnalysis(invented(YIELD, 2), settings({ siteModel: "random" }));
    const anova = exportTables(r, "2026-05-03", true).find((t) => t.name === "ANOVA")!;
    const labels = Object.values(ANOVA_SOURCE_LABELS);
    for (const row of anova.rows) {
      expect(labels).toContain(row[1]);
      if (row[7] !== null) expect(labels).toContain(row[7]);
    }
    expect(anova.rows.map((row) => row[1])).toEqual(expect.arrayContaining(["Variety", "Variety × site", "Residual (error)"]));
  });

  it("names a corrected value's column by the trait's name, not its internal key", () => {
    const [c] = describeCorrections(
      [{ at: new Date("2026-05-03T14:05:00Z"), actor: "Ana", oldValue: { plot: "S01-1-02", column: "marketable_yield", value: "2,100" }, newValue: { plot: "S01-1-02", column: "marketable_yield", value: "2,300", source: "form" } }],
      [{ key: "marketable_yield", name: "Marketable yield" }],
    );
    expect(c).toEqual({ plotCode: "S01-1-02", column: "Marketable yield", from: "2,100", to: "2,300", by: "Ana", when: "May 3, 2026, 14:05 UTC", fromUpload: false });
  });

  it("names varieties in the notes of the analysis a publication freezes, though the trial is not yet published", () => {
    const input = invented(YIELD, 3);
    expect(runAnalysis(input, settings()).notes.join(" ")).not.toMatch(/Invented \d/);
    expect(runAnalysis(input, settings(), { forPublication: true }).notes.join(" ")).toMatch(/Best combined mean \(highest\): Invented \d/);
  });
});
