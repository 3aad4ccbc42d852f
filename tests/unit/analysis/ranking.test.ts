import { describe, expect, it } from "vitest";
import { assignRanks, compareWithCheck, extremeWord, inStatedOrder, leaderHeading, orderWords } from "@/lib/domain/analysis/ranking";
import { runAnalysis } from "@/lib/domain/analysis/run";
import type { AnalysisInput, InputTrait } from "@/lib/domain/analysis/types";

// Invented means; what is checked is who comes first for each direction, not any statistic.
const means = () => [
  { name: "early", mean: 21, lsMean: null, rank: null as number | null, isCheck: false },
  { name: "late", mean: 23.8, lsMean: null, rank: null as number | null, isCheck: true },
  { name: "middle", mean: 22, lsMean: 22.4, rank: null as number | null, isCheck: false },
];

describe("ranking follows the trait's direction", () => {
  it("ranks the earliest first when lower is better", () => {
    const m = means();
    assignRanks(m, "lower");
    expect(inStatedOrder(m).map((x) => [x.name, x.rank])).toEqual([["early", 1], ["middle", 2], ["late", 3]]);
  });

  it("ranks the highest first when higher is better, on the least-squares mean when there is one", () => {
    const m = means();
    assignRanks(m, "higher");
    expect(inStatedOrder(m).map((x) => [x.name, x.rank])).toEqual([["late", 1], ["middle", 2], ["early", 3]]);
  });

  it("ranks nobody when neither direction is better, and lists the lowest first", () => {
    const m = means();
    assignRanks(m, "neither");
    expect(m.every((x) => x.rank === null)).toBe(true);
    expect(inStatedOrder(m).map((x) => x.name)).toEqual(["early", "middle", "late"]);
  });

  it("gives equal means the same rank", () => {
    const m = [{ mean: 5, lsMean: null, rank: null as number | null }, { mean: 7, lsMean: null, rank: null as number | null }, { mean: 5, lsMean: null, rank: null as number | null }];
    assignRanks(m, "lower");
    expect(m.map((x) => x.rank)).toEqual([1, 3, 1]);
  });

  it("states the order in words a grower reads, never calling a no-preference trait best", () => {
    const days = { computation: "days_from_sowing" };
    expect(orderWords({ ...days, betterWhen: "lower" })).toBe("earliest first (earlier is better)");
    expect(orderWords({ ...days, betterWhen: "neither" })).toMatch(/^earliest first/);
    expect(leaderHeading({ ...days, betterWhen: "neither" })).toBe("Earliest here");
    expect(leaderHeading({ ...days, betterWhen: "lower" })).toBe("Best here (earliest)");
    expect(leaderHeading({ computation: "none", betterWhen: "higher" })).toBe("Best here (highest)");
    expect(extremeWord({ computation: "none", betterWhen: "lower" }, "last")).toBe("highest");
  });
});

describe("% of check", () => {
  it("puts the check at 100 and each entry as a share of it, judged against the LSD", () => {
    const c = compareWithCheck(means(), 1.5);
    expect(c[1]).toEqual({ percentOfCheck: 100, checkDifference: 0, beyondLsd: false });
    expect(c[0]!.percentOfCheck).toBeCloseTo((100 * 21) / 23.8, 10);
    expect(c[0]!.checkDifference).toBeCloseTo(-2.8, 10);
    expect(c[0]!.beyondLsd).toBe(true);
    expect(c[2]!.checkDifference).toBeCloseTo(-1.4, 10);
    expect(c[2]!.beyondLsd).toBe(false);
  });

  it("compares with the mean of the checks when a trial has two", () => {
    const m = means().map((x) => ({ ...x, isCheck: x.name !== "early" }));
    expect(compareWithCheck(m, null)[0]).toEqual({ percentOfCheck: (100 * 21) / ((23.8 + 22.4) / 2), checkDifference: 21 - (23.8 + 22.4) / 2, beyondLsd: null });
  });

  it("gives nothing without a check, and no percentage of a zero check mean", () => {
    expect(compareWithCheck(means().map((x) => ({ ...x, isCheck: false })), 1)).toEqual(Array(3).fill({ percentOfCheck: null, checkDifference: null, beyondLsd: null }));
    expect(compareWithCheck([{ mean: 0, lsMean: null, isCheck: true }, { mean: 1, lsMean: null, isCheck: false }], null)[1]!.percentOfCheck).toBeNull();
    // a least-squares check mean below zero (rare yes/no events) gives no percentage, not "-1,500%"
    expect(compareWithCheck([{ mean: 0.01, lsMean: -0.01, isCheck: true }, { mean: 0.2, lsMean: 0.21, isCheck: false }], null)[1]).toEqual({ percentOfCheck: null, checkDifference: 0.22, beyondLsd: null });
  });
});

describe("the analysis ranks and words each direction", () => {
  // Two sites, three entries, four blocks; entry A is earliest by about 3 days, C latest.
  function daysTrial(betterWhen: InputTrait["betterWhen"], status: AnalysisInput["trial"]["status"] = "analysing"): AnalysisInput {
    const trait: InputTrait = { id: 1, code: "harvest_date", name: "First harvest date", unit: "date", valueType: "date", computation: "days_from_sowing", betterWhen };
    const entries = ["A", "B", "C"].map((code, i) => ({ id: i + 1, blindCode: `K-${code}`, entryNumber: i + 1, varietyName: `Invented ${code}`, varietyId: 10 + i, isCheck: code === "B", labelGermination: null, seedLot: null }));
    const sites = [1, 2].map((id) => ({ id, name: `Site ${id}`, sownOn: "2026-04-01", transplantedOn: null, status: "accepted" as const }));
    const plots = [];
    const observations = [];
    let plotId = 0;
    for (const site of sites) for (let block = 1; block <= 4; block++) for (const entry of entries) {
      plotId++;
      plots.push({ id: plotId, plotCode: `${site.id}${block}${entry.id}`, siteId: site.id, entryId: entry.id, block });
      const day = 40 + 3 * entry.id + ((block * entry.id + site.id) % 3);
      observations.push({ plotId, traitId: 1, occasion: 0, valueNumber: null, valueDate: `2026-05-${String(day - 30).padStart(2, "0")}`, missingReason: null });
    }
    return { trial: { id: 1, code: "INV-D", title: "Invented", crop: "Lettuce", blocks: 4, status }, traits: [trait], entries, sites, plots, observations, exclusions: [] };
  }
  const settings = { traitId: 1, siteIds: null, includeUnaccepted: false, siteModel: "random" as const, separation: "lsd" as const };

  it("lower is better: the earliest entry ranks 1 at every site and across sites, and the note calls it best", () => {
    const r = runAnalysis(daysTrial("lower"), settings);
    for (const block of [r.combined!, ...r.perSite.map((s) => s.result!)]) expect(block.means.find((m) => m.rank === 1)!.blindCode).toBe("K-A");
    expect(r.notes.find((n) => n.startsWith("Best combined mean"))).toMatch(/^Best combined mean \(earliest\): K-A \(43\.0 days\)/);
  });

  it("no preference: nothing is ranked or called best, and the note states the order plainly", () => {
    const r = runAnalysis(daysTrial("neither"), settings);
    expect(r.combined!.means.every((m) => m.rank === null)).toBe(true);
    expect(r.notes.join(" ")).not.toMatch(/best/i);
    expect(r.notes.find((n) => n.startsWith("Combined means"))).toMatch(/^Combined means, earliest first .*: earliest K-A .* latest K-C/);
  });

  it("names varieties in the notes once the trial is published, codes before", () => {
    expect(runAnalysis(daysTrial("lower", "published"), settings).notes.join(" ")).toContain("Invented A (43.0 days)");
    expect(runAnalysis(daysTrial("lower", "analysing"), settings).notes.join(" ")).not.toContain("Invented A");
  });

  it("gives % of the check beside every entry mean", () => {
    const r = runAnalysis(daysTrial("lower"), settings);
    const check = r.combined!.means.find((m) => m.isCheck)!;
    expect(check.percentOfCheck).toBe(100);
    const a = r.combined!.means.find((m) => m.blindCode === "K-A")!;
    expect(a.percentOfCheck).toBeCloseTo((100 * (a.lsMean ?? a.mean)) / (check.lsMean ?? check.mean), 10);
    expect(a.beyondLsd).toBe(r.combined!.lsd === null ? null : Math.abs(a.checkDifference!) > r.combined!.lsd);
  });
});

describe("ties", () => {
  it("ranks means equal up to a least-squares solve's rounding as a tie", () => {
    const m = [{ mean: 20, lsMean: 20.000000000004, rank: null as number | null }, { mean: 20, lsMean: 20, rank: null as number | null }, { mean: 21, lsMean: 21, rank: null as number | null }];
    assignRanks(m, "lower");
    expect(m.map((x) => x.rank)).toEqual([1, 1, 3]);
  });
});
