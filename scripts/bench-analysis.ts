// Times one trait's analysis for a large invented trial (50 sites x 40 entries x 4 blocks = 8,000 plots):
// cold (first run) and cached (same data version and settings, as the API serves a repeat request).
// Usage: npx tsx scripts/bench-analysis.ts [sites] [entries] [blocks]
import { runAnalysis } from "../lib/analysis/run";
import type { AnalysisInput, AnalysisResult, AnalysisSettings } from "../lib/analysis/types";

const [sites = 50, entries = 40, blocks = 4] = process.argv.slice(2).map(Number);

function lcg(seed: number) {
  let s = seed >>> 0;
  return () => ((s = (1664525 * s + 1013904223) >>> 0) / 2 ** 32);
}

function build(): AnalysisInput {
  const random = lcg(20260401);
  const traits = [
    { id: 1, code: "seeds_sown", name: "Seeds sown", unit: "seeds", valueType: "count" as const, computation: "none" as const },
    { id: 2, code: "emerged_final", name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count" as const, computation: "none" as const },
    { id: 3, code: "marketable_yield", name: "Marketable yield", unit: "g per plot", valueType: "number" as const, computation: "none" as const },
  ];
  const entryRows = Array.from({ length: entries }, (_, i) => ({ id: i + 1, blindCode: `E${i + 1}`, entryNumber: i + 1, varietyName: `Invented ${i + 1}`, varietyId: i + 1, isCheck: i === 0, labelGermination: 85, seedLot: null }));
  const siteRows = Array.from({ length: sites }, (_, i) => ({ id: 1000 + i, name: `Site ${i + 1}`, sownOn: "2026-04-01", transplantedOn: null, status: "accepted" as const }));
  const plots: AnalysisInput["plots"] = [];
  const observations: AnalysisInput["observations"] = [];
  let id = 1;
  for (const site of siteRows) {
    const siteEffect = 300 * (random() - 0.5);
    for (let block = 1; block <= blocks; block++) {
      for (const entry of entryRows) {
        const plotId = id++;
        plots.push({ id: plotId, plotCode: `${site.id}-${block}-${entry.entryNumber}`, siteId: site.id, entryId: entry.id, block });
        const value = random() < 0.01 ? null : 2000 + siteEffect + entry.entryNumber * 5 + 150 * (random() - 0.5);
        observations.push({ plotId, traitId: 3, occasion: 0, valueNumber: value, valueDate: null, missingReason: value === null ? "animal_damage" : null });
        observations.push({ plotId, traitId: 1, occasion: 0, valueNumber: 20, valueDate: null, missingReason: null });
        observations.push({ plotId, traitId: 2, occasion: 0, valueNumber: Math.round(14 + 5 * random()), valueDate: null, missingReason: null });
      }
    }
  }
  return { trial: { id: 1, code: "BENCH", title: "Benchmark", crop: "Lettuce", blocks }, traits, entries: entryRows, sites: siteRows, plots, observations, exclusions: [] };
}

const input = build();
const settings: AnalysisSettings = { traitId: 3, siteIds: null, includeUnaccepted: false, siteModel: "random", separation: "lsd" };
const cache = new Map<string, AnalysisResult>();
const run = () => {
  const key = JSON.stringify(settings);
  const hit = cache.get(key);
  if (hit) return hit;
  const result = runAnalysis(input, settings);
  cache.set(key, result);
  return result;
};
let t = performance.now();
const result = run();
const cold = performance.now() - t;
t = performance.now();
for (let i = 0; i < 1000; i++) run();
const cached = (performance.now() - t) / 1000;
const json = JSON.stringify(result).length;
console.log(`${sites} sites x ${entries} entries x ${blocks} blocks = ${input.plots.length} plots`);
console.log(`cold analysis: ${cold.toFixed(0)} ms (per-site ANOVAs, combined ANOVA, LSD, germination); JSON ${(json / 1024).toFixed(0)} KiB`);
console.log(`cached: ${(cached * 1000).toFixed(1)} µs per request before serialising (a 304 needs only the version query)`);
console.log(`combined entry F = ${result.combined?.entryF?.toFixed(2)}, CV = ${result.combined?.cv.toFixed(1)}%`);
