import { describe, expect, it } from "vitest";
import { CELLS_PER_FLAT, flatsUsed, insertNumber, packTrays } from "@/lib/domain/design/trays";

describe("packTrays", () => {
  it("never splits a block that fits in one 72-cell flat", () => {
    for (const entries of [2, 3, 4, 5, 7, 11, 12]) {
      for (const blocks of [1, 3, 4, 6]) {
        const layout = packTrays({ blockSizes: Array(blocks).fill(entries), cellsPerPlot: 6 });
        for (const block of layout) expect(new Set(block.map((p) => p.tray)).size).toBe(1);
      }
    }
  });

  it("uses at most 72 cells per flat and never overlaps cells", () => {
    const layout = packTrays({ blockSizes: [5, 5, 5, 5, 5], cellsPerPlot: 6 }).flat();
    const byTray = new Map<number, number[]>();
    for (const p of layout) {
      const cells = byTray.get(p.tray) ?? [];
      for (let c = p.firstCell; c < p.firstCell + p.cells; c += 1) cells.push(c);
      byTray.set(p.tray, cells);
    }
    for (const cells of byTray.values()) {
      expect(Math.max(...cells)).toBeLessThanOrEqual(CELLS_PER_FLAT);
      expect(new Set(cells).size).toBe(cells.length);
    }
  });

  it("fills a flat with twelve inserts when blocks pack exactly (4 entries x 3 blocks)", () => {
    const layout = packTrays({ blockSizes: [4, 4, 4, 4], cellsPerPlot: 6 });
    expect(layout.slice(0, 3).flat().map((p) => insertNumber(p.firstCell))).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(layout[3]!.every((p) => p.tray === 2 && p.firstCell <= 24)).toBe(true);
    expect(flatsUsed(layout)).toBe(2);
  });

  it("starts a new flat rather than straddling (5 inserts per block: two blocks per flat)", () => {
    const layout = packTrays({ blockSizes: [5, 5, 5], cellsPerPlot: 6 });
    expect(layout.map((b) => b[0]!.tray)).toEqual([1, 1, 2]);
  });

  it("spills a block bigger than a flat across flats without splitting a plot", () => {
    const layout = packTrays({ blockSizes: [14], cellsPerPlot: 6 }).flat();
    expect(layout.filter((p) => p.tray === 1)).toHaveLength(12);
    expect(layout.filter((p) => p.tray === 2)).toHaveLength(2);
    const odd = packTrays({ blockSizes: [8], cellsPerPlot: 10 }).flat();
    expect(odd.every((p) => p.firstCell + p.cells - 1 <= 72)).toBe(true);
  });

  it("refuses a plot larger than a flat", () => {
    expect(() => packTrays({ blockSizes: [1], cellsPerPlot: 73 })).toThrow(RangeError);
  });
});
