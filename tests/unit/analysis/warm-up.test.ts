import { describe, expect, it } from "vitest";
import { runAnalysis } from "@/lib/domain/analysis/run";
import { syntheticTrial, warmUpAnalysis } from "@/lib/domain/analysis/warm-up";

// The server compiles the analysis at start by analysing a made-up trial (server/analysis/warm-up.ts). It only
// helps if that trial takes every step a real multi-site analysis takes, missing plots and seed counts included.
describe("the made-up trial the server analyses at start", () => {
  it("goes through every step of a multi-site analysis: each site, the combined analysis with letters and stability, germination", () => {
    const input = syntheticTrial(8, 40, 4);
    const yieldTrait = input.traits.find((t) => t.code === "marketable_yield")!;
    const result = runAnalysis(input, { traitId: yieldTrait.id, siteIds: null, includeUnaccepted: false, siteModel: "random", separation: "lsd" });
    expect(result.perSite).toHaveLength(8);
    for (const site of result.perSite) {
      expect(site.problem).toBeNull();
      expect(site.result!.missing).toBe(1);
    }
    expect(result.perSite.some((s) => s.result!.means.some((m) => m.letter !== null))).toBe(true);
    expect(result.combined).not.toBeNull();
    expect(result.combined!.sites).toBe(8);
    expect(result.combined!.means.every((m) => m.lsMean !== null)).toBe(true);
    expect(result.combined!.stability).not.toBeNull();
    expect(result.germination?.bySite.length).toBe(8 * 40);
    expect(result.missing).toHaveLength(8);
  });

  it("is the same trial every time, so every start compiles the same paths", () => {
    expect(syntheticTrial(3, 5, 2)).toEqual(syntheticTrial(3, 5, 2));
    expect(warmUpAnalysis(1)).toBeGreaterThan(0);
  });
});
