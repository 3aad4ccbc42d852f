import { describe, expect, it } from "vitest";
import { anovaRcbd, compactLetters, lsdLetters, pairwiseLsd } from "@/lib/domain/stats";

// The analysis asks only for the LSD letters (lsdLetters), not every pair's t test; both must give the same letters.

function lcg(seed: number) {
  let state = seed >>> 0;
  return () => (state = (1664525 * state + 1013904223) >>> 0) / 2 ** 32;
}

/** An RCBD of `entries` x `blocks` with real differences between entries and a few plots missing. */
function trialTable(seed: number, entries: number, blocks: number, missingShare: number) {
  const random = lcg(seed);
  const plots = [];
  for (let b = 1; b <= blocks; b++) {
    for (let e = 1; e <= entries; e++) {
      const missing = random() < missingShare;
      plots.push({ block: String(b), entry: `E${e}`, value: missing ? null : 100 + 4 * e + 10 * b + 30 * (random() - 0.5) });
    }
  }
  return anovaRcbd(plots);
}

describe("letters of the LSD comparison", () => {
  it("the letters-only LSD gives the full pairwise LSD's letters, with and without missing plots", () => {
    for (const [seed, entries, blocks, missing] of [
      [1, 8, 3, 0],
      [2, 40, 4, 0.03],
      [3, 60, 4, 0.05],
      [4, 25, 2, 0],
    ] as const) {
      const table = trialTable(seed, entries, blocks, missing);
      expect(lsdLetters(table), `seed ${seed}`).toEqual(pairwiseLsd(table).letters);
    }
  });

  it("two entries share a letter exactly when they do not differ, for many entries", () => {
    const random = lcg(7);
    const labels = Array.from({ length: 45 }, (_, i) => `E${i + 1}`);
    const means = labels.map((_, i) => i + random());
    // Entries differ when their means are far apart, as a real comparison would say.
    const comparisons = [];
    for (let j = 0; j < labels.length; j++) for (let i = j + 1; i < labels.length; i++) comparisons.push({ a: labels[i]!, b: labels[j]!, differ: Math.abs(means[i]! - means[j]!) > 6 });
    const letters = compactLetters(labels, means, comparisons);
    for (const c of comparisons) {
      const share = [...letters[c.a]!].some((ch) => letters[c.b]!.includes(ch));
      expect(share, `${c.a} and ${c.b}`).toBe(!c.differ);
    }
  });
});
