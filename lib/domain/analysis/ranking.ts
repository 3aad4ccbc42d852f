/**
 * Which entry comes first, and how each compares with the check. Every ranking, "best" claim and % of
 * check the product shows is computed here, so the pages, the PDF, the exports and the public API agree.
 */
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import type { EntryResult } from "./types";
import { capitalise } from "@/lib/domain/vocabulary/words";

type Ranked = Pick<EntryResult, "mean" | "lsMean" | "rank">;
type Comparable = Pick<EntryResult, "mean" | "lsMean" | "isCheck">;

/** The value an entry is ranked and compared on: its least-squares mean when there is one. */
export function rankedValue(m: Pick<EntryResult, "mean" | "lsMean">): number {
  return m.lsMean ?? m.mean;
}

/** Equal up to rounding in the last digits of a least-squares solve (20 and 20.000000000004 tie). */
function sameValue(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

/**
 * Sets `rank` on each mean: 1 is the best for the trait's direction; equal values share a rank. With no
 * preferred direction nothing is ranked (rank null), because a rank would read as "best".
 */
export function assignRanks<T extends Ranked>(means: T[], betterWhen: BetterWhen): void {
  if (betterWhen === "neither") {
    for (const m of means) m.rank = null;
    return;
  }
  const sign = betterWhen === "higher" ? -1 : 1;
  const sorted = [...means].sort((a, b) => sign * (rankedValue(a) - rankedValue(b)));
  sorted.forEach((m, i) => {
    const previous = sorted[i - 1];
    m.rank = previous && sameValue(rankedValue(previous), rankedValue(m)) ? previous.rank : i + 1;
  });
}

/**
 * The order tables and charts list entries in: best first when the trait has a direction, otherwise
 * lowest (earliest, for days) first, which `orderWords` states.
 */
export function inStatedOrder<T extends Pick<EntryResult, "mean" | "lsMean"> & { rank: number | null }>(means: readonly T[]): T[] {
  return [...means].sort((a, b) => (a.rank !== null && b.rank !== null ? a.rank - b.rank : rankedValue(a) - rankedValue(b)));
}

type TraitShape = { betterWhen: BetterWhen; computation: string };

const isDays = (trait: { computation: string }) => trait.computation !== "none";

/** How the list is ordered, in words: "highest first (higher is better)", "earliest first", ... */
export function orderWords(trait: TraitShape): string {
  if (trait.betterWhen === "higher") return "highest first (higher is better)";
  if (trait.betterWhen === "lower") return isDays(trait) ? "earliest first (earlier is better)" : "lowest first (lower is better)";
  return isDays(trait) ? "earliest first (neither earlier nor later is better in itself)" : "lowest first (neither higher nor lower is better in itself)";
}

/** The word for the entry that comes first: "highest", "earliest", "lowest". */
export function extremeWord(trait: TraitShape, which: "first" | "last"): string {
  const lowFirst = trait.betterWhen !== "higher";
  const low = which === "first" ? lowFirst : !lowFirst;
  if (isDays(trait)) return low ? "earliest" : "latest";
  return low ? "lowest" : "highest";
}

/** The heading for the entry that comes first at a site: "Best here (earliest)", or plainly "Earliest here". */
export function leaderHeading(trait: TraitShape): string {
  const word = extremeWord(trait, "first");
  return trait.betterWhen === "neither" ? `${capitalise(word)} here` : `Best here (${word})`;
}

/** Whether the mean comparison found no pair that differs: every entry shares one letter. */
export function noPairDiffers(means: readonly { letter: string | null }[]): boolean {
  const letters = means.map((m) => m.letter);
  if (letters.length < 2 || letters.some((l) => !l)) return false;
  return [...letters[0]!].some((ch) => letters.every((l) => l!.includes(ch)));
}

/** A short label of the direction for column headers and settings. */
export function directionLabel(betterWhen: BetterWhen): string {
  return betterWhen === "higher" ? "Higher is better" : betterWhen === "lower" ? "Lower is better" : "No preference";
}

export interface CheckComparison {
  /** entry mean as a percentage of the check's (check = 100); null without a check or when the check's mean is not above 0 (a yes/no check with no "yes", or a least-squares mean pushed below 0 by missing plots) */
  percentOfCheck: number | null;
  /** entry mean minus the check's mean */
  checkDifference: number | null;
  /** whether that difference is larger than the LSD 0.05; null when there is no LSD to compare with */
  beyondLsd: boolean | null;
}

/**
 * Each entry against the check entry (with several checks, against the mean of their means: common
 * practice). The difference is judged against the LSD 0.05 when one was computed.
 */
export function compareWithCheck(means: readonly Comparable[], lsd: number | null): CheckComparison[] {
  const checks = means.filter((m) => m.isCheck);
  if (checks.length === 0) return means.map(() => ({ percentOfCheck: null, checkDifference: null, beyondLsd: null }));
  const reference = checks.reduce((sum, m) => sum + rankedValue(m), 0) / checks.length;
  return means.map((m) => {
    const difference = rankedValue(m) - reference;
    return {
      percentOfCheck: reference > 0 ? (100 * rankedValue(m)) / reference : null,
      checkDifference: difference,
      beyondLsd: lsd === null ? null : Math.abs(difference) > lsd,
    };
  });
}

/** " (beyond the LSD)", " (within the LSD)", or nothing when there is no LSD to judge by. */
export function lsdWords(beyondLsd: boolean | null): string {
  return beyondLsd === null ? "" : beyondLsd ? " (beyond the LSD)" : " (within the LSD)";
}
