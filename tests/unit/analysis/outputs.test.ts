import { describe, expect, it } from "vitest";
import { runAnalysis } from "@/lib/domain/analysis/run";
import { toBlindPayload, toCooperatorView } from "@/lib/domain/analysis/blind";
import { toPublicSnapshot } from "@/lib/domain/publish/public-shape";
import type { AnalysisInput, AnalysisResult, InputObservation, InputPlot } from "@/lib/domain/analysis/types";
import type { PublishedSnapshot } from "@/lib/domain/publish/types";

// The grower's blind view and the public shape are allow-lists: each is built field by field, so a
// field that appears in the analysis or the stored snapshot later does not reach growers or the public.

const traits = [
  { id: 1, code: "marketable_yield", betterWhen: "higher" as const, name: "Marketable yield", unit: "g", valueType: "number" as const, computation: "none" as const },
  { id: 3, code: "seeds_sown", betterWhen: "neither" as const, name: "Seeds sown", unit: "seeds", valueType: "count" as const, computation: "none" as const },
  { id: 4, code: "emerged_final", betterWhen: "higher" as const, name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count" as const, computation: "none" as const },
  { id: 5, code: "emergence_count", betterWhen: "higher" as const, name: "Seedlings emerged (count)", unit: "seedlings", valueType: "count" as const, computation: "none" as const },
];

/** Invented data: three entries (the first is the check), three sites (one not accepted), three blocks, every section filled. */
function input(): AnalysisInput {
  const entries = ["Invented Alpha", "Invented Beta", "Invented Gamma"].map((name, i) => ({
    id: 40 + i,
    blindCode: ["ZQK", "MDA", "TRX"][i]!,
    entryNumber: i + 1,
    varietyName: name,
    varietyId: 900 + i,
    isCheck: i === 0,
    labelGermination: 85 + i,
    seedLot: `Invented Seeds lot ${i}`,
  }));
  const sites = [0, 1, 2].map((i) => ({ id: 70 + i, name: `Site ${i + 1}`, sownOn: "2026-04-01", transplantedOn: null, status: (i === 1 ? "submitted" : "accepted") as "accepted" | "submitted", resultsShared: i === 0 }));
  const plots: InputPlot[] = [];
  const observations: InputObservation[] = [];
  let id = 5000;
  for (const site of sites)
    for (let block = 1; block <= 3; block++)
      for (const e of entries) {
        const plotId = id++;
        plots.push({ id: plotId, plotCode: `${site.id}-${block}-${e.entryNumber}`, siteId: site.id, entryId: e.id, block });
        const v = (n: number) => ({ plotId, occasion: 0, valueDate: null, missingReason: null, valueNumber: n });
        observations.push({ ...v(100 + e.entryNumber * 9 + block * 2 + (plotId % 5)), traitId: 1 }, { ...v(20), traitId: 3 }, { ...v(14 + (plotId % 4)), traitId: 4 });
        observations.push({ ...v(5 + (plotId % 3)), traitId: 5, occasion: 5 }, { ...v(12 + (plotId % 3)), traitId: 5, occasion: 10 });
      }
  return {
    trial: { id: 1, code: "INV-9", title: "Invented", crop: "Kale", blocks: 3, status: "analysing" },
    traits,
    entries,
    sites,
    plots,
    observations,
    exclusions: [{ id: 1, siteId: null, plotId: 5001, traitId: null, category: "plot_damaged", note: "Invented Beta eaten by deer", createdAt: "2026-05-01T00:00:00.000Z", createdBy: "Rosa" }],
  };
}

const result = (includeUnaccepted = true) => runAnalysis(input(), { traitId: 1, siteIds: null, includeUnaccepted, siteModel: "random", separation: "lsd" });

/** The same value with `leak: "LEAKED"` added to every object in it, standing for a field added later. */
function withExtraFields<T>(value: T): T {
  if (Array.isArray(value)) return value.map(withExtraFields) as T;
  if (value && typeof value === "object") return { ...Object.fromEntries(Object.entries(value).map(([k, v]) => [k, withExtraFields(v)])), leak: "LEAKED" } as T;
  return value;
}

describe("what growers may see", () => {
  it("the blind view carries no names, check flag, label germination, seed lot, coordinator's note or field added later", () => {
    const full = result();
    expect(full.germination?.labels.length).toBe(3);
    expect(full.emergence?.kinetics.length).toBe(3);
    const text = JSON.stringify(toBlindPayload(withExtraFields(full), true));
    for (const word of ["Invented Alpha", "Invented Beta", "Invented Gamma", "Invented Seeds", "isCheck", "labelPercent", "seedLot", "varietyName", "varietyId", "deer", "Rosa", "LEAKED", "label comparison"]) {
      expect(text, word).not.toContain(word);
    }
  });

  it("numbers entries by blind code, so the coordinator's entry order does not show", () => {
    const view = toBlindPayload(result(), true);
    const codes = ["MDA", "TRX", "ZQK"];
    expect(view.combined!.means.map((m) => [m.blindCode, m.entryId])).toEqual(codes.map((c, i) => [c, i + 1]));
    expect(view.germination!.byEntry.map((g) => g.blindCode)).toEqual(codes);
    expect(view.emergence!.kinetics.map((k) => k.blindCode)).toEqual(codes);
    const idOf = new Map(view.combined!.means.map((m) => [m.blindCode, m.entryId]));
    for (const p of view.plots!) expect(p.entryId).toBe(idOf.get(p.blindCode));
    for (const c of view.combined!.cellMeans) expect(codes).toContain([...idOf].find(([, id]) => id === c.entryId)?.[0]);
  });

  it("keeps the figures: the blind view's means equal the full result's", () => {
    const full = result();
    const view = toBlindPayload(full);
    for (const m of full.combined!.means) expect(view.combined!.means.find((x) => x.blindCode === m.blindCode)).toMatchObject({ mean: m.mean, se: m.se, letter: m.letter, rank: m.rank });
  });

  it("after publication a grower gets the keyed view", () => {
    const published: AnalysisResult = { ...result(), trial: { ...result().trial, status: "published" } };
    expect("blind" in toCooperatorView(published)).toBe(false);
    expect("blind" in toCooperatorView(result())).toBe(true);
  });
});

describe("what the public may see", () => {
  function snapshot(): PublishedSnapshot {
    // As publishing runs it: accepted data only, so the submitted site is listed as left out and why.
    const r = result(false);
    expect(r.sites.find((x) => x.status === "submitted")?.why).toMatch(/not accepted yet/);
    return {
      schemaVersion: 1,
      version: 1,
      publishedAt: "2026-06-01T00:00:00.000Z",
      changeNote: null,
      settings: { siteModel: "random", separation: "lsd" },
      program: "Invented program",
      trial: { id: 77, code: "INV-9", title: "Invented", crop: "Kale", cropGroup: "brassicas", season: "Spring 2026", year: 2026, purpose: null, design: "rcbd", blocks: 3, plotUnit: "insert", plotSize: 6, protocol: null },
      scopeTraitId: null,
      sites: [{ id: 70, name: "Site 1", kind: "farm", region: "North", growingSetup: "field", soil: null, irrigation: null, publicDescription: null, sownOn: "2026-04-01" }],
      entries: input().entries.map((e) => ({ blindCode: e.blindCode, entryNumber: e.entryNumber, varietyId: e.varietyId!, variety: e.varietyName!, isCheck: e.isCheck, seedSource: "Invented Seeds", lotCode: "L1", labelGermination: e.labelGermination, treated: false })),
      traits: traits.map((t) => ({ id: t.id, code: t.code, name: t.name, unit: t.unit, valueType: t.valueType, analysedAs: t.name, description: null })),
      results: [{ traitId: 1, result: r }],
      summary: ["Invented summary."],
      data: [],
      citation: "Invented.",
    };
  }

  it("the public shape has no review state, sharing flag, internal id or field added later", () => {
    const shape = toPublicSnapshot(withExtraFields(snapshot()));
    const text = JSON.stringify(shape);
    for (const word of ["LEAKED", "submitted", "not accepted", "accepted\"", "shared", "siteId", "entryId", "plotId", "traitId", '"id":77', "entryNumber", "schemaVersion", "Rosa"]) expect(text, word).not.toContain(word);
    expect(shape.results.map((r) => r.trait)).toEqual(["marketable_yield"]);
    expect(shape.sites.map((x) => x.id)).toEqual([70]);
    expect(shape.results[0]!.result.combined!.cellMeans.map((c) => c.blindCode).sort()).toEqual(["MDA", "MDA", "TRX", "TRX", "ZQK", "ZQK"]);
  });
});
