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

  it("the letters are those of the textbook insert-and-absorb over every column, for irregular patterns too", () => {
    // Piepho's insert-absorb as written: after each split, drop every column contained in another (the first of two equal ones stays).
    function reference(labels: string[], means: number[], differ: (i: number, j: number) => boolean): Record<string, string> {
      const k = labels.length;
      const order = labels.map((_, i) => i).sort((x, y) => means[y]! - means[x]! || x - y);
      let columns: number[][] = [order.map((_, rank) => rank)];
      for (let i = 0; i < k - 1; i++) {
        for (let j = i + 1; j < k; j++) {
          if (!differ(order[i]!, order[j]!)) continue;
          const split = columns.flatMap((c) => (c.includes(i) && c.includes(j) ? [c.filter((x) => x !== i), c.filter((x) => x !== j)] : [c]));
          const contained = (a: number[], b: number[]) => a.every((x) => b.includes(x));
          columns = split.filter((a, p) => !split.some((b, r) => r !== p && contained(a, b) && (!contained(b, a) || p > r)));
        }
      }
      columns.sort((a, b) => Math.min(...a) - Math.min(...b));
      const letters: Record<string, string> = {};
      order.forEach((entry, rank) => (letters[labels[entry]!] = columns.flatMap((c, n) => (c.includes(rank) ? ["abcdefghijklmnopqrstuvwxyz"[n] ?? `${n}`] : [])).join("")));
      return Object.fromEntries(labels.map((l) => [l, letters[l]!]));
    }
    for (let seed = 1; seed <= 60; seed++) {
      const random = lcg(seed);
      const k = 3 + Math.floor(random() * 22);
      const labels = Array.from({ length: k }, (_, i) => `E${i + 1}`);
      const means = labels.map(() => Math.round(random() * 20));
      // differences that need not follow the means (as with missing plots), so columns split in irregular ways
      const differs = new Map<string, boolean>();
      const comparisons = [];
      for (let j = 0; j < k; j++) {
        for (let i = j + 1; i < k; i++) {
          const differ = Math.abs(means[i]! - means[j]!) > 6 || random() < 0.15;
          differs.set(`${i}:${j}`, differ);
          comparisons.push({ a: labels[i]!, b: labels[j]!, differ });
        }
      }
      const expected = reference(labels, means, (a, b) => differs.get(`${Math.max(a, b)}:${Math.min(a, b)}`)!);
      expect(compactLetters(labels, means, comparisons), `seed ${seed}`).toEqual(expected);
    }
  });
});
