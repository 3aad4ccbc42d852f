import { describe, expect, it } from "vitest";
import { packingList, seedsPerPlot, treatedCodes } from "@/lib/domain/design/kits";
import { cautionsFor } from "@/lib/domain/design/cautions";

const entries = [
  { blindCode: "K2", treated: true, lot: "Seed House · L2" },
  { blindCode: "A7", treated: false, lot: null },
  { blindCode: "Z9", treated: false, lot: "Seed House · L9" },
];

describe("seed kits", () => {
  it("counts seeds per plot from the plot unit: a six-cell insert, cells, or bed-row stations", () => {
    expect(seedsPerPlot({ plotUnit: "insert", plotSize: 6, seedsPerCell: 2 })).toBe(12);
    expect(seedsPerPlot({ plotUnit: "cells", plotSize: 12, seedsPerCell: 1 })).toBe(12);
    expect(seedsPerPlot({ plotUnit: "bed_row", plotSize: 10, seedsPerCell: 3 })).toBe(30);
  });

  it("packs only the codes laid out at the site, in code order, with 20% spare and never fewer than 2", () => {
    const plots = [{ blindCode: "K2" }, { blindCode: "A7" }, { blindCode: "K2" }];
    const rows = packingList(plots, entries, { plotUnit: "cells", plotSize: 4, seedsPerCell: 1 });
    expect(rows.map((r) => [r.blindCode, r.plots, r.seedsNeeded, r.spares, r.seedsToCount])).toEqual([
      ["A7", 1, 4, 2, 6],
      ["K2", 2, 8, 2, 10],
    ]);
    const big = packingList([{ blindCode: "Z9" }], entries, { plotUnit: "bed_row", plotSize: 41, seedsPerCell: 1 });
    expect(big[0]).toMatchObject({ seedsNeeded: 41, spares: 9, seedsToCount: 50 });
  });

  it("names the treated codes in the caution, and says nothing of treated seed when there is none", () => {
    expect(treatedCodes(entries)).toEqual(["K2"]);
    const caution = cautionsFor({ treatedCodes: ["K2", "M4"], plotUnit: "insert", growingSetup: "field" })[0]!;
    expect(caution.text).toMatch(/^The packets coded K2, M4 hold treated seed/);
    expect(cautionsFor({ treatedCodes: [], plotUnit: "insert", growingSetup: "field" }).some((c) => /treated/i.test(c.title))).toBe(false);
  });
});
