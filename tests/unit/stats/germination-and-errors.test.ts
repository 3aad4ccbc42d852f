// Wilson intervals against Newcombe (1998, Stat. Med. 17, 857-872, Table I, method 3), emergence
// kinetics against hand-worked values of the published formulas, and the typed errors.
import { describe, expect, it } from "vitest";
import {
  anovaMultiSite,
  anovaOneWay,
  anovaRcbd,
  bartlett,
  chiSquareGoodnessOfFit,
  chiSquareIndependence,
  emergenceKinetics,
  germinationByEntry,
  StatsError,
  wilsonInterval,
} from "@/lib/domain/stats";

function expectStatsError(run: () => unknown, code: string): void {
  let caught: unknown;
  try {
    run();
  } catch (error) {
    caught = error;
  }
  expect(caught).toBeInstanceOf(StatsError);
  expect((caught as StatsError).code).toBe(code);
  expect((caught as StatsError).message.length).toBeGreaterThan(20);
}

describe("Wilson score interval (Newcombe 1998, Table I)", () => {
  it("81/263: 0.2553 to 0.3662", () => {
    const ci = wilsonInterval(81, 263);
    expect(Math.abs(ci.lower - 0.2553)).toBeLessThan(5e-5);
    expect(Math.abs(ci.upper - 0.3662)).toBeLessThan(5e-5);
  });
  it("15/148: 0.0624 to 0.1605", () => {
    const ci = wilsonInterval(15, 148);
    expect(Math.abs(ci.lower - 0.0624)).toBeLessThan(5e-5);
    expect(Math.abs(ci.upper - 0.1605)).toBeLessThan(5e-5);
  });
  it("0/20: 0 to 0.1611", () => {
    const ci = wilsonInterval(0, 20);
    expect(ci.lower).toBe(0);
    expect(Math.abs(ci.upper - 0.1611)).toBeLessThan(5e-5);
  });
  it("germinationByEntry reports percent with the interval in percent", () => {
    const [row] = germinationByEntry([{ entry: "A", sown: 263, emerged: 81 }]);
    expect(Math.abs(row.lower - 25.53)).toBeLessThan(5e-3);
    expect(Math.abs(row.upper - 36.62)).toBeLessThan(5e-3);
  });
});

describe("emergence kinetics (Ellis & Roberts 1980 MET; Coolbear et al. 1984 T50), worked by hand", () => {
  it("stand 10, 30, 40 of 50 sown on days 4, 6, 8: final 80%, MET (10*4 + 20*6 + 10*8)/40 = 6, T50 = 4 + (20-10)(6-4)/(30-10) = 5", () => {
    const result = emergenceKinetics(
      [
        { day: 4, emerged: 10 },
        { day: 6, emerged: 30 },
        { day: 8, emerged: 40 },
      ],
      50,
    );
    expect(result.finalPercent).toBe(80);
    expect(result.meanEmergenceTime).toBeCloseTo(6, 12);
    expect(result.t50).toBeCloseTo(5, 12);
  });
  it("half the final stand at the first count interpolates from sowing (day 0): 30 of final 40 on day 5 gives T50 = 5 * 20/30", () => {
    const result = emergenceKinetics(
      [
        { day: 5, emerged: 30 },
        { day: 9, emerged: 40 },
      ],
      40,
    );
    expect(result.t50).toBeCloseTo(10 / 3, 12);
  });
  it("rejects a falling stand and counts above seeds sown", () => {
    expectStatsError(() => emergenceKinetics([{ day: 3, emerged: 10 }, { day: 5, emerged: 8 }], 20), "INVALID_COUNT");
    expectStatsError(() => emergenceKinetics([{ day: 3, emerged: 21 }], 20), "EMERGED_EXCEEDS_SOWN");
  });
});

describe("bad input throws a typed StatsError with a plain message", () => {
  const plots = [
    { block: "1", entry: "A", value: 1 },
    { block: "1", entry: "B", value: 2 },
    { block: "2", entry: "A", value: 1.5 },
    { block: "2", entry: "B", value: 2.7 },
    { block: "3", entry: "A", value: 1.1 },
    { block: "3", entry: "B", value: 2.2 },
  ];
  it("fewer than two entries", () => {
    expectStatsError(() => anovaOneWay([{ entry: "A", value: 1 }, { entry: "A", value: 2 }]), "TOO_FEW_ENTRIES");
    expectStatsError(() => anovaRcbd(plots.filter((p) => p.entry === "A")), "TOO_FEW_ENTRIES");
  });
  it("an entry with no observed plots", () => {
    expectStatsError(() => anovaOneWay([{ entry: "A", value: 1 }, { entry: "A", value: 2 }, { entry: "B", value: null }]), "EMPTY_ENTRY");
  });
  it("a block with no observed plots", () => {
    expectStatsError(() => anovaRcbd([...plots, { block: "4", entry: "A", value: null }, { block: "4", entry: "B", value: null }]), "EMPTY_BLOCK");
  });
  it("non-finite values (NaN, Infinity, text)", () => {
    expectStatsError(() => anovaOneWay([{ entry: "A", value: 1 }, { entry: "B", value: Number.NaN }, { entry: "B", value: 3 }]), "NON_FINITE_VALUE");
    expectStatsError(() => anovaRcbd([...plots.slice(1), { block: "1", entry: "A", value: Infinity }]), "NON_FINITE_VALUE");
    expectStatsError(() => anovaOneWay([{ entry: "A", value: "3" as unknown as number }, { entry: "B", value: 1 }]), "NON_FINITE_VALUE");
  });
  it("zero residual degrees of freedom", () => {
    expectStatsError(() => anovaOneWay([{ entry: "A", value: 1 }, { entry: "B", value: 2 }]), "NO_RESIDUAL_DF");
    expectStatsError(() => anovaRcbd(plots.slice(0, 2)), "NO_RESIDUAL_DF");
  });
  it("a multi-site analysis of one site", () => {
    expectStatsError(() => anovaMultiSite(plots.map((p) => ({ ...p, site: "S1" }))), "TOO_FEW_GROUPS");
  });
  it("negative counts, emerged above sown, and an all-zero chi-square row", () => {
    expectStatsError(() => germinationByEntry([{ entry: "A", sown: -5, emerged: 0 }]), "INVALID_COUNT");
    expectStatsError(() => germinationByEntry([{ entry: "A", sown: 50, emerged: 51 }]), "EMERGED_EXCEEDS_SOWN");
    expectStatsError(() => chiSquareIndependence([[0, 0], [3, 4]]), "EMPTY_TABLE_ROW");
    expectStatsError(() => chiSquareGoodnessOfFit([-1, 3], [0.5, 0.5]), "INVALID_COUNT");
  });
  it("groups without variance in Bartlett's test", () => {
    expectStatsError(() => bartlett([[1, 1, 1], [2, 3, 4]]), "NO_VARIATION");
  });
});
