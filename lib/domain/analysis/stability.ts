/**
 * Stability across sites for one trait's combined analysis: each variety's response to the site mean
 * (Finlay-Wilkinson slope, scatter about it, Shukla's variance) with a plain reading, and the GGE
 * biplot scores. The numbers come from lib/domain/stats `stability`; this module decides what is said.
 */
import { fUpper, isStatsError, stability, studentTTwoSided, STABILITY_MIN_ENVIRONMENTS } from "@/lib/domain/stats";
import { plural } from "@/lib/domain/vocabulary/words";
import { hasCv } from "./format";
import type { CombinedAnalysis, InputEntry, InputTrait } from "./types";

/** Significance level of the stability readings (as every other test on the page). */
const STABILITY_ALPHA = 0.05;
/** Below this many sites a slope rests on so few points that readings are only a first indication (common practice: 6 or more environments). */
export const STABILITY_FIRM_SITES = 6;

export type SlopeReading = "more" | "less" | "average";

export interface StabilityRow {
  entryId: number;
  blindCode: string;
  varietyName: string | null;
  varietyId: number | null;
  isCheck: boolean;
  /** mean of the variety's site means */
  mean: number;
  /** Finlay-Wilkinson slope on the site mean: 1 = average response */
  slope: number;
  slopeSe: number;
  /** p of the test that the slope differs from 1 */
  slopeP: number;
  /** residual mean square about the variety's line (Eberhart & Russell's deviation from regression) */
  deviationMs: number;
  /** p of the test that the scatter exceeds what plot-to-plot error explains */
  deviationP: number | null;
  ecovalence: number;
  shuklaVariance: number;
  slopeReading: SlopeReading;
  scattered: boolean;
  /** one plain sentence, no variety named */
  reading: string;
}

export interface StabilityAnalysis {
  sites: number;
  rows: StabilityRow[];
  gge: {
    /** share explained by the first and second components */
    explained: [number, number];
    entries: { entryId: number; blindCode: string; varietyName: string | null; pc1: number; pc2: number }[];
    sites: { siteId: number; siteName: string; pc1: number; pc2: number }[];
  };
  /** what the section says in plain words, with the caution due to few sites */
  notes: string[];
}

/**
 * The stability of every variety in the combined analysis, or why there is none. Cell means are the
 * plain means of each variety's plots at a site (what the response chart draws).
 */
export function analyseStability(combined: CombinedAnalysis, trait: InputTrait, entries: Map<number, InputEntry>): { stability: StabilityAnalysis | null; problem: string | null } {
  if (!hasCv(trait)) return { stability: null, problem: "Stability is worked out for measured traits, not yes/no ones." };
  if (combined.sites < STABILITY_MIN_ENVIRONMENTS) {
    return { stability: null, problem: `Stability across sites needs at least ${STABILITY_MIN_ENVIRONMENTS} analysed sites (there ${combined.sites === 1 ? "is" : "are"} ${combined.sites}).` };
  }
  let result;
  try {
    result = stability(combined.cellMeans.map((c) => ({ environment: String(c.siteId), entry: String(c.entryId), mean: c.mean })));
  } catch (e) {
    if (!isStatsError(e)) throw e;
    return { stability: null, problem: e.message.replace(/^(\d+) has no mean at ([\d, ]+);/, (_, entryId: string, siteIds: string) => `${entryName(entries, Number(entryId))} has no value at ${siteIds.split(", ").map((id) => siteName(combined, Number(id))).join(", ")};`) };
  }
  const sites = result.gge.environmentScores.length;
  const residual = combined.rows.find((r) => r.source === "residual");
  // each site mean of a variety averages n plots; Eberhart & Russell test the scatter against error / n
  const harmonicPlots = combined.cellMeans.length / combined.cellMeans.reduce((s, c) => s + 1 / c.n, 0);
  const cellError = residual && residual.df > 0 && residual.ms > 0 ? residual.ms / harmonicPlots : null;

  const rows: StabilityRow[] = result.entries.map((s) => {
    const entry = entries.get(Number(s.entry))!;
    const slopeP = s.slopeSe > 0 ? studentTTwoSided((s.slope - 1) / s.slopeSe, sites - 2) : s.slope === 1 ? 1 : 0;
    const deviationP = cellError === null ? null : fUpper(s.deviationMs / cellError, sites - 2, residual!.df);
    const slopeReading: SlopeReading = slopeP < STABILITY_ALPHA ? (s.slope > 1 ? "more" : "less") : "average";
    const scattered = deviationP !== null && deviationP < STABILITY_ALPHA;
    return {
      entryId: entry.id,
      blindCode: entry.blindCode,
      varietyName: entry.varietyName,
      varietyId: entry.varietyId,
      isCheck: entry.isCheck,
      mean: s.mean,
      slope: s.slope,
      slopeSe: s.slopeSe,
      slopeP,
      deviationMs: s.deviationMs,
      deviationP,
      ecovalence: s.ecovalence,
      shuklaVariance: s.shuklaVariance,
      slopeReading,
      scattered,
      reading: readingOf(slopeReading, scattered, trait),
    };
  });
  rows.sort((a, b) => entries.get(a.entryId)!.entryNumber - entries.get(b.entryId)!.entryNumber);

  // A component's sign is arbitrary; turn the first so sites score positive on it, as biplots are read
  // (then a variety further right did better on average), and the second so its largest site score is positive.
  const flip1 = Math.sign(result.gge.environmentScores.reduce((s, e) => s + e.pc1, 0)) || 1;
  const biggest2 = result.gge.environmentScores.reduce((a, e) => (Math.abs(e.pc2) > Math.abs(a) ? e.pc2 : a), 0);
  const flip2 = Math.sign(biggest2) || 1;
  const gge: StabilityAnalysis["gge"] = {
    explained: [result.gge.explained[0]!, result.gge.explained[1]!],
    entries: result.gge.entryScores.map((g) => {
      const entry = entries.get(Number(g.entry))!;
      return { entryId: entry.id, blindCode: entry.blindCode, varietyName: entry.varietyName, pc1: flip1 * g.pc1, pc2: flip2 * g.pc2 };
    }),
    sites: result.gge.environmentScores.map((g) => ({ siteId: Number(g.environment), siteName: siteName(combined, Number(g.environment)), pc1: flip1 * g.pc1, pc2: flip2 * g.pc2 })),
  };
  return { stability: { sites, rows, gge, notes: stabilityNotes(rows, sites, cellError !== null) }, problem: null };
}

function entryName(entries: Map<number, InputEntry>, id: number): string {
  return entries.get(id)?.blindCode ?? String(id);
}

function siteName(combined: CombinedAnalysis, id: number): string {
  return combined.cellMeans.find((c) => c.siteId === id)?.siteName ?? String(id);
}

/** A grower's reading of one variety's line: how it responds to better sites, and how predictable it is. */
export function readingOf(slope: SlopeReading, scattered: boolean, trait: Pick<InputTrait, "betterWhen">): string {
  const response =
    slope === "more"
      ? trait.betterWhen === "higher"
        ? "Responds more than average to good sites: gains the most where growing is good, loses more where it is poor"
        : "Swings more than average between sites: further up where the site mean is high, further down where it is low"
      : slope === "less"
        ? "Holds steadier than average across sites: changes less than most between poor and good sites"
        : "Responds to better and poorer sites like the average variety";
  const spread = scattered ? "; its results also jump around that trend from site to site, so it is hard to predict at any one farm" : "";
  return `${response}${spread}.`;
}

function stabilityNotes(rows: StabilityRow[], sites: number, scatterTested: boolean): string[] {
  const notes = [
    `The slope compares each variety's mean at a site with that site's mean over all varieties: 1 is the average response, above 1 a variety that changes more than most between sites, below 1 one that changes less (Finlay-Wilkinson slope, tested against 1 at α = ${STABILITY_ALPHA}).`,
  ];
  if (sites < STABILITY_FIRM_SITES) {
    notes.push(`With only ${plural(sites, "site")}, each slope rests on ${sites} points, so only large differences show; read these as a first indication and look again after another season.`);
  }
  const more = rows.filter((r) => r.slopeReading === "more").length;
  const less = rows.filter((r) => r.slopeReading === "less").length;
  if (more === 0 && less === 0) notes.push("No variety's response to the sites differed clearly from the average.");
  if (scatterTested) notes.push("The scatter about each line (deviation mean square) is compared with plot-to-plot error; Shukla's variance measures how much a variety changes places with the others (0 or below: as steady as this trial can tell).");
  return notes;
}
