import { describe, expect, it } from "vitest";
import { runAnalysis } from "@/lib/domain/analysis/run";
import { daysBetween, plotValue } from "@/lib/domain/analysis/values";
import type { AnalysisInput, AnalysisSettings, InputObservation, InputPlot } from "@/lib/domain/analysis/types";

const TRAIT = { id: 1, code: "marketable_yield", betterWhen: "higher" as const, name: "Marketable yield", unit: "g per plot", valueType: "number" as const, computation: "none" as const };
const DAYS = { id: 2, code: "harvest_date", betterWhen: "neither" as const, name: "First harvest date", unit: "date", valueType: "date" as const, computation: "days_from_sowing" as const };
const SOWN = { id: 3, code: "seeds_sown", betterWhen: "neither" as const, name: "Seeds sown", unit: "seeds", valueType: "count" as const, computation: "none" as const };
const FINAL = { id: 4, code: "emerged_final", betterWhen: "higher" as const, name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count" as const, computation: "none" as const };

// Invented, deterministic data: entry effects, a site effect and a fixed pseudo-random plot error.
function build(opts: { sites: number; noisySite?: number; emergedLow?: boolean; statuses?: ("accepted" | "submitted")[] }): AnalysisInput {
  const entries = [0, 1, 2, 3].map((i) => ({ id: 10 + i, blindCode: `E${i}`, entryNumber: i + 1, varietyName: `Invented ${i}`, varietyId: 100 + i, isCheck: i === 0, labelGermination: i === 3 ? null : 90, seedLot: "Lot" }));
  const sites = Array.from({ length: opts.sites }, (_, s) => ({ id: 50 + s, name: `Site ${s + 1}`, sownOn: "2026-04-01", transplantedOn: null, status: opts.statuses?.[s] ?? ("accepted" as const) }));
  const plots: InputPlot[] = [];
  const observations: InputObservation[] = [];
  let id = 1000;
  const noise = [3, -5, 2, 7, -1, -6, 4, 0, -3, 5, -2, 1, 6, -4, -7, 2];
  for (const site of sites) {
    for (let block = 1; block <= 4; block++) {
      for (const entry of entries) {
        const plotId = id++;
        plots.push({ id: plotId, plotCode: `${site.id}-${block}-${entry.entryNumber}`, siteId: site.id, entryId: entry.id, block });
        const k = (plotId * 7 + (site.id - 50) * 5) % noise.length;
        const scale = site.id - 50 === opts.noisySite ? 40 : 2;
        const value = 100 + entry.entryNumber * 6 + (site.id - 50) * 4 + block + noise[k]! * scale;
        observations.push({ plotId, traitId: 1, occasion: 0, valueNumber: value, valueDate: null, missingReason: null });
        observations.push({ plotId, traitId: 2, occasion: 0, valueNumber: null, valueDate: `2026-05-${String(10 + entry.entryNumber + (k % 3)).padStart(2, "0")}`, missingReason: null });
        observations.push({ plotId, traitId: 3, occasion: 0, valueNumber: 10, valueDate: null, missingReason: null });
        observations.push({ plotId, traitId: 4, occasion: 0, valueNumber: opts.emergedLow ? (entry.entryNumber > 1 && k % 4 === 0 ? 1 : 0) : 7 + (k % 3), valueDate: null, missingReason: null });
      }
    }
  }
  return { trial: { id: 1, code: "INV-1", title: "Invented trial", crop: "Lettuce", blocks: 4, status: "analysing" }, traits: [SOWN, FINAL, DAYS, TRAIT], entries, sites, plots, observations, exclusions: [] };
}

const settings = (over: Partial<AnalysisSettings> = {}): AnalysisSettings => ({ traitId: 1, siteIds: null, includeUnaccepted: false, siteModel: "random", separation: "lsd", ...over });

describe("plain-language notes", () => {
  it("says at how many sites varieties differed, in the trait's own words", () => {
    const result = runAnalysis(build({ sites: 3 }), settings());
    expect(result.notes[0]).toMatch(/^Varieties (differed|did not differ clearly) in marketable yield \(g per plot\) at (all 3 sites|\d of 3 sites|any of the 3 sites) \(F test, α = 0\.05\)\.$/);
    expect(result.notes.some((n) => /^Across 3 sites, varieties (differed|did not differ clearly) \(F = [\d.]+, p/.test(n))).toBe(true);
    expect(result.notes.some((n) => /variety × site/.test(n))).toBe(true);
  });

  it("describes date traits as days from sowing", () => {
    const result = runAnalysis(build({ sites: 2 }), settings({ traitId: 2 }));
    expect(result.trait.analysedAs).toBe("First harvest date (days from sowing)");
    expect(result.perSite[0]!.result!.grandMean).toBeGreaterThan(39);
    expect(result.notes[0]).toMatch(/first harvest date \(days from sowing\)/);
  });

  it("names the one missing plot in the singular and says how it was handled", () => {
    const input = build({ sites: 2 });
    input.observations.find((o) => o.traitId === 1)!.valueNumber = null;
    input.observations.find((o) => o.traitId === 1)!.missingReason = "animal_damage";
    const result = runAnalysis(input, settings());
    expect(result.missing).toEqual([expect.objectContaining({ reason: "animal damage", handling: expect.stringMatching(/least squares/) })]);
    expect(result.notes).toContain("1 plot is missing; it is left out and the means are least-squares estimates, which equal plain means when nothing is missing.");
  });

  it("says apart the missing plots of a site that could not be analysed, which take no part in the means", () => {
    const input = build({ sites: 3 });
    const yieldOf = (siteId: number, block?: number) =>
      input.observations.filter((o) => o.traitId === 1 && input.plots.some((p) => p.id === o.plotId && p.siteId === siteId && (block === undefined || p.block === block)));
    // Site 3 keeps one block of yields only, so it cannot be analysed; one of its plots in that block is lost.
    for (const o of yieldOf(52).filter((o) => !yieldOf(52, 1).includes(o))) o.valueNumber = null;
    const lost = yieldOf(52, 1)[0]!;
    lost.valueNumber = null;
    lost.missingReason = "animal_damage";
    // And one plot at the analysed Site 1.
    yieldOf(50)[0]!.valueNumber = null;
    const result = runAnalysis(input, settings());
    expect(result.perSite.find((s) => s.siteId === 52)!.result).toBeNull();
    expect(result.missing.filter((m) => m.siteName === "Site 3")).toHaveLength(13);
    expect(result.notes).toContain("1 plot is missing; it is left out and the means are least-squares estimates, which equal plain means when nothing is missing.");
    expect(result.notes).toContain("13 missing plots are at a site that could not be analysed for this trait (its reason is given), so they take no part in these means.");
  });

  it("explains each analysis choice in one line", () => {
    const random = runAnalysis(build({ sites: 2 }), settings());
    const fixed = runAnalysis(build({ sites: 2 }), settings({ siteModel: "fixed", separation: "tukey" }));
    expect(random.explanations.siteModel).toMatch(/^Sites random/);
    expect(fixed.explanations.siteModel).toMatch(/^Sites fixed/);
    expect(fixed.explanations.separation).toMatch(/^Tukey/);
    expect(fixed.combined!.comparisonNote).toMatch(/^Tukey found/);
  });
});

describe("warnings", () => {
  it("flags a site whose CV is far above the others and unequal residual variances", () => {
    const result = runAnalysis(build({ sites: 4, noisySite: 2 }), settings());
    expect(result.warnings.some((w) => /^Site 3's CV \([\d.]+%\) is more than 2 times the other sites' median/.test(w))).toBe(true);
    expect(result.warnings.some((w) => /^Residual variances differ across sites \(Bartlett K² = /.test(w))).toBe(true);
  });

  it("flags a site with too few blocks to analyse and leaves it out of the combined analysis", () => {
    const input = build({ sites: 3 });
    for (const o of input.observations) {
      const plot = input.plots.find((p) => p.id === o.plotId)!;
      if (o.traitId === 1 && plot.siteId === 52 && plot.block > 1) o.valueNumber = null;
    }
    const result = runAnalysis(input, settings());
    expect(result.warnings).toContain("Site 3 has too few blocks with data (1) to analyse; it is left out of the combined analysis.");
    expect(result.combined!.sites).toBe(2);
  });

  it("flags low expected counts in the germination chi-square", () => {
    const result = runAnalysis(build({ sites: 2, emergedLow: true }), settings());
    expect(result.warnings.some((w) => /chi-square table has \d+ cells? with an expected count below 5/.test(w))).toBe(true);
  });

  it("marks data not yet accepted and leaves them out unless asked", () => {
    const input = build({ sites: 3, statuses: ["accepted", "accepted", "submitted"] });
    const strict = runAnalysis(input, settings());
    expect(strict.sites.find((s) => s.id === 52)).toMatchObject({ included: false, why: "data submitted, not accepted yet" });
    const loose = runAnalysis(input, settings({ includeUnaccepted: true }));
    expect(loose.perSite).toHaveLength(3);
    expect(loose.warnings[0]).toBe("Includes data not yet accepted from Site 3 (submitted); these figures may change after review.");
  });

  it("applies and lists exclusions without losing the data", () => {
    const input = build({ sites: 3 });
    input.exclusions.push({ id: 1, siteId: 51, plotId: null, traitId: null, category: "plot_damaged", note: "flooded in May", createdAt: "2026-06-01T00:00:00.000Z", createdBy: "Invented Person" });
    const result = runAnalysis(input, settings());
    expect(result.sites.find((s) => s.id === 51)!.why).toBe("excluded: plot damaged (animals, hail, flooding)");
    expect(result.perSite.map((s) => s.siteId)).toEqual([50, 52]);
    expect(result.exclusions[0]).toMatchObject({ siteName: "Site 2", publicReason: "plot damaged (animals, hail, flooding)", note: "flooded in May" });
    expect(result.germination!.cmh!.sites).toBe(2);
  });

  it("lists one plot's exclusion for one trait under that trait only, with its plot code and site", () => {
    const input = build({ sites: 2 });
    const plot = input.plots.find((p) => p.siteId === 51)!;
    input.exclusions.push({ id: 7, siteId: null, plotId: plot.id, traitId: 1, category: "seed_mix_up", note: "Invented staff note", createdAt: "2026-06-01T00:00:00.000Z", createdBy: null });
    const yieldResult = runAnalysis(input, settings());
    expect(yieldResult.exclusions.map((x) => [x.plotCode, x.siteName, x.publicReason])).toEqual([[plot.plotCode, "Site 2", "wrong seed or a seed mix-up"]]);
    expect(yieldResult.missing.find((m) => m.plotCode === plot.plotCode)!.reason).toBe("excluded: wrong seed or a seed mix-up");
    // Harvest date still counts the plot, and says nothing of the yield exclusion.
    const daysResult = runAnalysis(input, settings({ traitId: 2 }));
    expect(daysResult.exclusions).toEqual([]);
    expect(daysResult.notes.some((n) => /left out|exclu/.test(n))).toBe(false);
  });
});

describe("values", () => {
  it("turns dates into days from sowing and missing dates into a reason", () => {
    expect(daysBetween("2026-04-01", "2026-05-16")).toBe(45);
    const site = { id: 1, name: "S", sownOn: null, transplantedOn: null, status: "accepted" as const };
    expect(plotValue(DAYS, site, [{ plotId: 1, traitId: 2, occasion: 0, valueNumber: null, valueDate: "2026-05-01", missingReason: null }])).toEqual({ value: null, reason: "site has no sowing date" });
  });
});
