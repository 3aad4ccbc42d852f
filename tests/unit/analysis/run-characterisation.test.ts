import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { runAnalysis } from "@/lib/domain/analysis/run";
import type { AnalysisInput, AnalysisSettings, InputExclusion, InputObservation, InputPlot, InputTrait, SubmissionState } from "@/lib/domain/analysis/types";
import { seededRandom } from "@/lib/domain/design/random";

// Characterisation of runAnalysis: seeded, invented trials covering every branch (sites left out for
// each reason, missing and excluded plots, text / date / yes-no / count traits, too few blocks, no
// variation, one or several sites, both site models and both separations). The JSON of each result
// is pinned, byte for byte, so a restructuring of the function cannot change what anyone is shown.

const TRAITS: InputTrait[] = [
  { id: 1, code: "marketable_yield", betterWhen: "higher", name: "Marketable yield", unit: "g", valueType: "number", computation: "none" },
  { id: 2, code: "harvest_date", betterWhen: "neither", name: "First harvest date", unit: "date", valueType: "date", computation: "days_from_sowing" },
  { id: 3, code: "seeds_sown", betterWhen: "neither", name: "Seeds sown", unit: "seeds", valueType: "count", computation: "none" },
  { id: 4, code: "emerged_final", betterWhen: "higher", name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count", computation: "none" },
  { id: 5, code: "emergence_count", betterWhen: "higher", name: "Seedlings emerged (count)", unit: "seedlings", valueType: "count", computation: "none" },
  { id: 6, code: "bolting", betterWhen: "lower", name: "Bolting", unit: null, valueType: "yes_no", computation: "none" },
  { id: 7, code: "notes", betterWhen: "neither", name: "Grower notes", unit: null, valueType: "text", computation: "none" },
  { id: 8, code: "flowering", betterWhen: "neither", name: "Flowering", unit: "date", valueType: "date", computation: "days_from_transplant" },
  { id: 9, code: "vigour", betterWhen: "higher", name: "Vigour", unit: null, valueType: "rating", computation: "none" },
];
const STATUSES: SubmissionState[] = ["accepted", "accepted", "submitted", "returned", "draft"];
const REASONS = [null, null, null, null, "died", "animal_damage", "weather", "custom reason"];

function scenario(seed: number): { input: AnalysisInput; settings: AnalysisSettings } {
  const next = seededRandom(seed);
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)]!;
  const siteCount = 1 + Math.floor(next() * 5);
  const entryCount = 2 + Math.floor(next() * 5);
  const blocks = 1 + Math.floor(next() * 4);
  const flat = next() < 0.08; // every plot the same value: no variation to test against
  const entries = Array.from({ length: entryCount }, (_, i) => ({
    id: 20 + i,
    blindCode: `B${seed}-${i}`,
    entryNumber: entryCount - i,
    varietyName: next() < 0.2 ? null : `Invented ${i}`,
    varietyId: 300 + i,
    isCheck: i === 0,
    labelGermination: next() < 0.3 ? null : 80 + Math.floor(next() * 15),
    seedLot: next() < 0.5 ? null : `Lot ${i}`,
  }));
  const sites = Array.from({ length: siteCount }, (_, s) => ({
    id: 60 + s,
    name: `Site ${s + 1}`,
    sownOn: next() < 0.1 ? null : "2026-04-01",
    transplantedOn: next() < 0.5 ? null : "2026-04-20",
    status: pick(STATUSES),
    resultsShared: next() < 0.5,
  }));
  const plots: InputPlot[] = [];
  const observations: InputObservation[] = [];
  let id = 1000;
  for (const site of sites) {
    const siteEffect = next() * 30;
    const siteBlocks = next() < 0.15 ? 1 : blocks;
    const noise = next() < 0.2 ? 40 : 4;
    for (let block = 1; block <= siteBlocks; block++) {
      for (const entry of entries) {
        if (next() < 0.03) continue; // plot never laid out
        const plotId = id++;
        plots.push({ id: plotId, plotCode: `${site.id}-${block}-${entry.entryNumber}`, siteId: site.id, entryId: entry.id, block });
        const base = { plotId, occasion: 0, valueNumber: null, valueDate: null, missingReason: null };
        for (const trait of TRAITS) {
          if (next() < 0.06) continue; // not recorded
          const reason = pick(REASONS);
          if (reason !== null && next() < 0.3) {
            observations.push({ ...base, traitId: trait.id, missingReason: reason });
            continue;
          }
          const value = flat ? 50 : 100 + entry.id * 3 + siteEffect + block + Math.round((next() - 0.5) * noise * 10) / 10;
          if (trait.valueType === "date") {
            const day = 10 + Math.floor(flat ? 5 : next() * 15 + entry.id - 20);
            observations.push({ ...base, traitId: trait.id, valueDate: next() < 0.04 ? null : `2026-06-${String(day).padStart(2, "0")}` });
          } else if (trait.id === 3) observations.push({ ...base, traitId: 3, valueNumber: 20 });
          else if (trait.id === 4) observations.push({ ...base, traitId: 4, valueNumber: flat ? 10 : Math.floor(next() * 21) });
          else if (trait.id === 5) {
            observations.push({ ...base, traitId: 5, occasion: 5, valueNumber: Math.floor(next() * 10) });
            observations.push({ ...base, traitId: 5, occasion: 12, valueNumber: next() < 0.05 ? null : Math.floor(next() * 21) });
          } else if (trait.valueType === "yes_no") observations.push({ ...base, traitId: trait.id, valueNumber: next() < 0.4 ? 1 : 0 });
          else if (trait.valueType === "rating") observations.push({ ...base, traitId: trait.id, valueNumber: 1 + Math.floor(next() * 9) });
          else if (trait.valueType === "text") observations.push({ ...base, traitId: trait.id });
          else observations.push({ ...base, traitId: trait.id, valueNumber: next() < 0.05 ? null : value });
        }
      }
    }
  }
  const exclusions: InputExclusion[] = [];
  const exclusionCount = Math.floor(next() * 4);
  for (let x = 0; x < exclusionCount; x++) {
    const onSite = next() < 0.3;
    exclusions.push({
      id: x + 1,
      siteId: onSite ? pick(sites).id : null,
      plotId: onSite || plots.length === 0 ? null : pick(plots).id,
      traitId: next() < 0.5 ? null : pick(TRAITS).id,
      category: "other",
      note: `Invented reason ${x}`,
      createdAt: "2026-05-01T00:00:00.000Z",
      createdBy: next() < 0.5 ? null : "Rosa",
    });
  }
  const traitPool = next() < 0.5 ? TRAITS.filter((t) => t.id === 1) : TRAITS;
  const chosenSites = next() < 0.2 ? sites.filter(() => next() < 0.7).map((s) => s.id) : null;
  return {
    input: {
      trial: { id: seed, code: `INV-${seed}`, title: "Invented trial", crop: "Kale", blocks, status: "analysing" },
      traits: TRAITS,
      entries,
      sites,
      plots,
      observations,
      exclusions,
    },
    settings: {
      traitId: pick(traitPool).id,
      siteIds: chosenSites,
      includeUnaccepted: next() < 0.5,
      siteModel: next() < 0.5 ? "random" : "fixed",
      separation: next() < 0.5 ? "lsd" : "tukey",
    },
  };
}

const SEEDS = Array.from({ length: 80 }, (_, i) => 1000 + i);

describe("runAnalysis characterisation", () => {
  it("gives byte-for-byte the same result for 80 seeded invented trials", () => {
    const digests = SEEDS.map((seed) => {
      const { input, settings } = scenario(seed);
      return `${seed} ${createHash("sha256").update(JSON.stringify(runAnalysis(input, settings))).digest("hex").slice(0, 16)}`;
    });
    expect(digests).toMatchSnapshot();
  });

  it("gives the same full result for a four-site trial with missing plots, an entry without data and a one-block site (readable pin)", () => {
    const { input, settings } = scenario(1008);
    expect(JSON.parse(JSON.stringify(runAnalysis(input, settings)))).toMatchSnapshot();
  });
});
