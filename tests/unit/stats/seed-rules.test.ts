// 7 CFR 201.55 maximum tolerated ranges and 7 CFR 201.63 label tolerances, against the check
// values transcribed in tests/fixtures/seed-rules (project trade notes, section 3, and the printed
// 201.55 table for the low-average pairing; see that README).
import { describe, expect, it } from "vitest";
import { checkAgainstLabel, checkReplicateRange, labelTolerance, maxToleratedRange } from "@/lib/domain/stats";
import { readJson } from "./fixtures";

const rules = readJson("seed-rules/seed-rules.json");

describe("7 CFR 201.55 maximum range between 100-seed replicates (TRADE.md section 3)", () => {
  for (const row of rules.max_range_201_55) {
    it(`average ${row.average[0]}-${row.average[1]}%: 4 reps ${row.reps4}${row.reps2 === null ? "" : `, 2 reps ${row.reps2}`}`, () => {
      for (let average = row.average[0]; average <= row.average[1]; average++) {
        expect(maxToleratedRange(average, 4)).toBe(row.reps4);
        if (row.reps2 !== null) expect(maxToleratedRange(average, 2)).toBe(row.reps2);
      }
    });
  }
  it("low averages read as in the regulation's paired column (2 with 99, 30 with 71)", () => {
    for (const [low, high] of rules.low_average_pairs_201_55) expect(maxToleratedRange(low, 4)).toBe(maxToleratedRange(high, 4));
  });
  it("a 4 x 100 test at 90, 84, 96, 88 (range 12, average 89.5 -> 90: limit 12) needs no retest; 90, 82, 96, 88 does", () => {
    expect(checkReplicateRange([90, 84, 96, 88])).toMatchObject({ range: 12, maxRange: 12, retestNeeded: false });
    expect(checkReplicateRange([90, 82, 96, 88])).toMatchObject({ range: 14, retestNeeded: true });
  });
});

describe("7 CFR 201.63 tolerance between test and label (TRADE.md section 3)", () => {
  for (const row of rules.label_tolerance_201_63) {
    it(`mean germination ${row.mean[0]}-${row.mean[1]}%: ${row.tolerance} points, +${rules.extra_for_200_seeds} for 200 seeds`, () => {
      for (let mean = row.mean[0]; mean <= row.mean[1]; mean++) {
        expect(labelTolerance(mean)).toBe(row.tolerance);
        expect(labelTolerance(mean, 200)).toBe(row.tolerance + rules.extra_for_200_seeds);
      }
    });
  }
  it("label 85%, test 79% (mean 82: tolerance 7) is within tolerance; test 77% (mean 81) is not", () => {
    expect(checkAgainstLabel(79, 85)).toMatchObject({ shortfall: 6, tolerance: 7, withinTolerance: true });
    expect(checkAgainstLabel(77, 85)).toMatchObject({ shortfall: 8, tolerance: 7, withinTolerance: false });
  });
});
