/**
 * A made-up trial the server analyses when it starts, in memory (no database), so that V8 has compiled the
 * analysis's hot paths before the first real request: on a freshly started server the first analysis of a
 * 50-site trial otherwise spends most of its time in code that is still being interpreted and compiled
 * (README, benchmarks). The result is thrown away; nothing is cached or read from it.
 */
import { EMERGED_FINAL_CODE, SEEDS_SOWN_CODE } from "@/lib/domain/vocabulary/traits";
import { runAnalysis } from "./run";
import { analysisFor } from "./blind";
import { toPageView } from "./page-view";
import type { AnalysisInput, InputObservation, InputPlot } from "./types";

const YIELD = 1;
const SOWN = 2;
const EMERGED = 3;

/** A trial of `sites` x `entries` x `blocks` with a yield trait and seed counts, one yield value missing per site. */
export function syntheticTrial(sites: number, entries: number, blocks: number): AnalysisInput {
  // a fixed linear congruential sequence: the same trial every time
  let state = 20260401;
  const random = () => (state = (1664525 * state + 1013904223) >>> 0) / 2 ** 32;
  const plots: InputPlot[] = [];
  const observations: InputObservation[] = [];
  for (let s = 1; s <= sites; s++) {
    const siteEffect = 600 * (random() - 0.5);
    for (let b = 1; b <= blocks; b++) {
      for (let e = 1; e <= entries; e++) {
        const id = plots.length + 1;
        plots.push({ id, plotCode: `W${s}-${b}${String(e).padStart(2, "0")}`, siteId: s, entryId: e, block: b });
        const missing = b === 1 && e === s % entries + 1;
        const value = Math.round((2000 + siteEffect + 6 * e + 300 * (random() - 0.5)) * 10) / 10;
        observations.push({ plotId: id, traitId: YIELD, occasion: 0, valueNumber: missing ? null : value, valueDate: null, missingReason: missing ? "animal_damage" : null });
        observations.push({ plotId: id, traitId: SOWN, occasion: 0, valueNumber: 20, valueDate: null, missingReason: null });
        observations.push({ plotId: id, traitId: EMERGED, occasion: 0, valueNumber: Math.round(13 + 6 * random()), valueDate: null, missingReason: null });
      }
    }
  }
  return {
    trial: { id: 0, code: "WARM-UP", title: "Warm-up", crop: "Lettuce", blocks, status: "analysing" },
    traits: [
      { id: SOWN, code: SEEDS_SOWN_CODE, name: "Seeds sown", unit: "seeds", valueType: "count", computation: "none", betterWhen: "neither" },
      { id: EMERGED, code: EMERGED_FINAL_CODE, name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count", computation: "none", betterWhen: "higher" },
      { id: YIELD, code: "marketable_yield", name: "Marketable yield", unit: "g per plot", valueType: "number", computation: "none", betterWhen: "higher" },
    ],
    entries: Array.from({ length: entries }, (_, i) => ({
      id: i + 1,
      blindCode: `W${String(i + 1).padStart(3, "0")}`,
      entryNumber: i + 1,
      varietyName: `Variety ${i + 1}`,
      varietyId: i + 1,
      isCheck: i === 0,
      labelGermination: 90,
      seedLot: null,
    })),
    sites: Array.from({ length: sites }, (_, i) => ({ id: i + 1, name: `Site ${i + 1}`, sownOn: "2026-04-01", transplantedOn: null, status: "accepted" as const, resultsShared: false })),
    plots,
    observations,
    exclusions: [],
  };
}

/**
 * Analyses the made-up trial `rounds` times as the analysis API does for staff (least squares, LSD,
 * random sites; the viewer's shape and the page's first view). Returns the milliseconds it took.
 */
export function warmUpAnalysis(rounds: number): number {
  const started = performance.now();
  const input = syntheticTrial(8, 40, 4);
  const staff = { id: 0, email: "", name: "", role: "coordinator" as const };
  for (let i = 0; i < rounds; i++) {
    const result = runAnalysis(input, { traitId: YIELD, siteIds: null, includeUnaccepted: false, siteModel: "random", separation: "lsd" });
    toPageView(analysisFor(staff, result));
  }
  return performance.now() - started;
}
