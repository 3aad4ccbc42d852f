// One-way ANOVA on integer data checked against exact rational arithmetic (BigInt): many entries,
// plots in random order, missing plots, and one entry whose values sit near 1e9 while the others sit
// near 50, which a single reference value shared by all entries would not survive. Reference: the textbook identities
// within SS = sum over entries of (sum x^2 - (sum x)^2 / n), between SS = sum (sum x)^2 / n - (sum x)^2 / N,
// evaluated exactly.
import { describe, expect, it } from "vitest";
import { anovaOneWay } from "@/lib/domain/stats";
import { seededRandom as random } from "@/lib/domain/design/random";

interface Fraction { num: bigint; den: bigint }
const gcd = (a: bigint, b: bigint): bigint => {
  a = a < 0n ? -a : a;
  while (b) [a, b] = [b, a % b];
  return a;
};
const add = (x: Fraction, y: Fraction): Fraction => {
  const num = x.num * y.den + y.num * x.den;
  const den = x.den * y.den;
  const g = gcd(num, den) || 1n;
  return { num: num / g, den: den / g };
};
const toNumber = (f: Fraction) => Number(f.num) / Number(f.den);

function exactSums(data: { entry: string; value: number | null }[]) {
  const groups = new Map<string, { n: bigint; sum: bigint; squares: bigint }>();
  for (const { entry, value } of data) {
    if (value === null) continue;
    const g = groups.get(entry) ?? { n: 0n, sum: 0n, squares: 0n };
    const x = BigInt(value);
    g.n += 1n;
    g.sum += x;
    g.squares += x * x;
    groups.set(entry, g);
  }
  let within: Fraction = { num: 0n, den: 1n };
  let corrected: Fraction = { num: 0n, den: 1n };
  let total = 0n;
  let count = 0n;
  for (const g of groups.values()) {
    within = add(within, { num: g.squares * g.n - g.sum * g.sum, den: g.n });
    corrected = add(corrected, { num: g.sum * g.sum, den: g.n });
    total += g.sum;
    count += g.n;
  }
  const between = add(corrected, { num: -(total * total), den: count });
  return { within: toNumber(within), between: toNumber(between), entries: groups.size };
}

describe("anovaOneWay against exact arithmetic", () => {
  it("matches on 120 entries, 30,001 plots in random order with missing plots and one far-off entry", () => {
    const next = random(7);
    const data: { entry: string; value: number | null }[] = [];
    for (let i = 0; i < 30_001; i++) {
      const e = Math.floor(next() * 120);
      const base = e === 77 ? 1_000_000_000 : 50 + e;
      data.push({ entry: `V-${e}`, value: next() < 0.03 ? null : base + Math.floor(next() * 21) - 10 });
    }
    const exact = exactSums(data);
    const table = anovaOneWay(data);
    const [between, within] = table.rows;
    expect(table.entryMeans).toHaveLength(exact.entries);
    expect(between.df).toBe(exact.entries - 1);
    expect(table.missing).toBe(data.filter((plot) => plot.value === null).length);
    for (const { entry, n } of table.entryMeans) {
      expect(n, entry).toBe(data.filter((plot) => plot.entry === entry && plot.value !== null).length);
    }
    expect(Math.abs(between.ss - exact.between) / exact.between).toBeLessThan(1e-13);
    expect(Math.abs(within.ss - exact.within) / exact.within).toBeLessThan(1e-13);
  });

  it("gives the same table whatever the order of the plots", () => {
    const next = random(11);
    const data = Array.from({ length: 5_000 }, (_, i) => ({ entry: `E${i % 37}`, value: 1000 + (i % 37) + Math.floor(next() * 9) }));
    const shuffled = [...data].sort(() => next() - 0.5);
    const exact = exactSums(data);
    for (const table of [anovaOneWay(data), anovaOneWay(shuffled)]) {
      expect(Math.abs(table.rows[0].ss - exact.between) / exact.between).toBeLessThan(1e-13);
      expect(Math.abs(table.rows[1].ss - exact.within) / exact.within).toBeLessThan(1e-13);
    }
  });
});
