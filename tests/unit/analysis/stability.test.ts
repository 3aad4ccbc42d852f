import { describe, expect, it } from "vitest";
import { runAnalysis } from "@/lib/domain/analysis/run";
import { toBlindPayload } from "@/lib/domain/analysis/blind";
import { exportTables } from "@/lib/domain/analysis/export";
import { readingOf } from "@/lib/domain/analysis/stability";
import { toPublicTraitResult } from "@/lib/domain/publish/public-shape";
import { stability } from "@/lib/domain/stats";
import type { AnalysisInput, AnalysisSettings, InputObservation, InputPlot } from "@/lib/domain/analysis/types";

// Stability as the analysis page, a grower's blind view, the exports and the public shape carry it: an
// invented 4-site trial where variety C gains far more than the others at good sites.

const SITE_EFFECT = [0, 20, 40, 60];
const RESPONSE: Record<string, number> = { A: 1, B: 0.9, C: 1.6, D: 0.5 };
const NOISE = [0.3, -0.2, 0.1, -0.4, 0.2, 0.0, -0.1, 0.4, -0.3, 0.1, 0.2, -0.2];

function trial(siteCount = 4): { input: AnalysisInput; settings: AnalysisSettings } {
  const codes = Object.keys(RESPONSE);
  const entries = codes.map((c, i) => ({ id: 10 + i, blindCode: `K${c}`, entryNumber: i + 1, varietyName: `Secret ${c}`, varietyId: 500 + i, isCheck: i === 0, labelGermination: null, seedLot: null }));
  const sites = Array.from({ length: siteCount }, (_, s) => ({ id: 70 + s, name: `Farm ${s + 1}`, sownOn: "2026-04-01", transplantedOn: null, status: "accepted" as const, resultsShared: true }));
  const plots: InputPlot[] = [];
  const observations: InputObservation[] = [];
  let id = 1;
  for (const [s, site] of sites.entries()) {
    for (let block = 1; block <= 3; block++) {
      for (const [e, entry] of entries.entries()) {
        const plotId = id++;
        plots.push({ id: plotId, plotCode: `${s}-${block}-${e}`, siteId: site.id, entryId: entry.id, block });
        const value = 100 + 10 * e + RESPONSE[codes[e]!]! * SITE_EFFECT[s]! + NOISE[(plotId * 7) % NOISE.length]!;
        observations.push({ plotId, traitId: 1, occasion: 1, valueNumber: value, valueDate: null, missingReason: null });
      }
    }
  }
  return {
    input: {
      trial: { id: 1, code: "T-1", title: "Invented", crop: "Lettuce", blocks: 3, status: "analysing" },
      traits: [{ id: 1, code: "marketable_yield", name: "Marketable yield", unit: "g per plot", valueType: "number", computation: "none", betterWhen: "higher" }],
      entries,
      sites,
      plots,
      observations,
      exclusions: [],
    },
    settings: { traitId: 1, siteIds: null, includeUnaccepted: false, siteModel: "random", separation: "lsd" },
  };
}

describe("stability in the trial analysis", () => {
  const { input, settings } = trial();
  const result = runAnalysis(input, settings);
  const st = result.combined!.stability!;

  it("gives each variety the Finlay-Wilkinson slope, deviation MS and Shukla's variance of its site means", () => {
    const direct = stability(result.combined!.cellMeans.map((c) => ({ environment: String(c.siteId), entry: String(c.entryId), mean: c.mean })));
    for (const row of st.rows) {
      const d = direct.entries.find((x) => x.entry === String(row.entryId))!;
      expect(row.slope).toBeCloseTo(d.slope, 12);
      expect(row.deviationMs).toBeCloseTo(d.deviationMs, 12);
      expect(row.shuklaVariance).toBeCloseTo(d.shuklaVariance, 12);
    }
    expect(st.gge.explained[0] + st.gge.explained[1]).toBeLessThanOrEqual(1 + 1e-12);
  });

  it("reads a steep variety as responding more to good sites and a flat one as steadier, in plain words", () => {
    const c = st.rows.find((r) => r.blindCode === "KC")!;
    const d = st.rows.find((r) => r.blindCode === "KD")!;
    expect(c.slopeReading).toBe("more");
    expect(c.reading).toMatch(/^Responds more than average to good sites/);
    expect(d.slopeReading).toBe("less");
    expect(d.reading).toMatch(/^Holds steadier than average across sites/);
  });

  it("warns that 4 sites give only a first indication, and says nothing of the kind at 6", () => {
    expect(st.notes.join(" ")).toMatch(/With only 4 sites, each slope rests on 4 points/);
    SITE_EFFECT.push(80, 100);
    const six = trial(6);
    const r6 = runAnalysis(six.input, six.settings);
    SITE_EFFECT.splice(4);
    expect(r6.combined!.stability!.sites).toBe(6);
    expect(r6.combined!.stability!.notes.join(" ")).not.toMatch(/first indication/);
  });

  it("turns the biplot so sites score positive on component 1 (a variety further right did better on average)", () => {
    expect(st.gge.sites.reduce((s, x) => s + x.pc1, 0)).toBeGreaterThan(0);
    const byPc1 = [...st.gge.entries].sort((a, b) => b.pc1 - a.pc1).map((e) => e.blindCode);
    const byMean = [...st.rows].sort((a, b) => b.mean - a.mean).map((e) => e.blindCode);
    expect(byPc1[0]).toBe(byMean[0]);
  });

  it("a grower's blind view of stability names no variety, check or variety id, and renumbers entries by blind code", () => {
    const blind = toBlindPayload(result);
    const text = JSON.stringify(blind.combined!.stability);
    expect(text).not.toMatch(/Secret|varietyName|varietyId|isCheck/);
    expect(blind.combined!.stability!.rows.map((r) => r.blindCode)).toEqual(["KA", "KB", "KC", "KD"]);
    expect(blind.combined!.stability!.rows.map((r) => r.entryId)).toEqual([1, 2, 3, 4]);
  });

  it("gives no stability with fewer than 3 sites, and says why", () => {
    const two = trial(2);
    const r = runAnalysis(two.input, two.settings);
    expect(r.combined!.stability).toBeNull();
    expect(r.combined!.stabilityProblem).toBe("Stability across sites needs at least 3 analysed sites (there are 2).");
  });

  it("exports a Stability sheet and the biplot scores, with names only when asked", () => {
    const tables = exportTables(result, "2026-12-05T00:00:00Z", false);
    const sheet = tables.find((t) => t.name === "Stability")!;
    expect(sheet.rows).toHaveLength(4);
    expect(sheet.rows.map((r) => r[1])).toEqual([null, null, null, null]);
    expect(sheet.rows.find((r) => r[0] === "KC")![4]).toBeCloseTo(st.rows.find((r) => r.blindCode === "KC")!.slope, 12);
    expect(tables.find((t) => t.name === "GGE biplot")!.rows).toHaveLength(4 + 4 + 1);
    expect(exportTables(runAnalysis(trial(2).input, settings), "x", true).some((t) => t.name === "Stability")).toBe(false);
  });

  it("the public shape carries the stability rows with names (published) and an older version without them reads as none", () => {
    const shaped = toPublicTraitResult(result);
    expect(shaped.combined!.stability!.rows.map((r) => r.varietyName)).toEqual(["Secret A", "Secret B", "Secret C", "Secret D"]);
    const older = { ...result, combined: { ...result.combined!, stability: undefined as never, stabilityProblem: undefined as never } };
    expect(toPublicTraitResult(older).combined!.stability).toBeNull();
  });
});

describe("the plain reading of one variety", () => {
  it("words the response for a trait where lower is better without calling high-mean sites good", () => {
    expect(readingOf("more", false, { betterWhen: "lower" })).toMatch(/^Swings more than average between sites/);
    expect(readingOf("average", true, { betterWhen: "higher" })).toBe(
      "Responds to better and poorer sites like the average variety; its results also jump around that trend from site to site, so it is hard to predict at any one farm.",
    );
  });
});
