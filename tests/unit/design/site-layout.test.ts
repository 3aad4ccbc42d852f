import { describe, expect, it } from "vitest";
import { siteLayout } from "@/lib/domain/design/site-layout";
import { randomiseBlocks } from "@/lib/domain/design/randomise";

const base = { design: "rcbd" as const, blocks: 4, plotUnit: "insert" as const, plotSize: 6, entryCount: 5, seed: 777, siteNumber: 3 };

describe("siteLayout", () => {
  it("follows the seeded randomisation, with plot codes from the site's enrolment number", () => {
    const layout = siteLayout(base);
    expect(layout.map(({ block, position, entryIndex }) => ({ block, position, entryIndex }))).toEqual(randomiseBlocks({ entryCount: 5, blocks: 4, seed: 777 }));
    expect(layout[0]!.plotCode).toBe("S03-1-01");
    expect(siteLayout(base)).toEqual(layout);
  });

  it("puts five-insert blocks two to a flat, so no block straddles flats", () => {
    const layout = siteLayout(base);
    expect([1, 2, 3, 4].map((b) => [...new Set(layout.filter((p) => p.block === b).map((p) => p.tray))])).toEqual([[1], [1], [2], [2]]);
    expect(layout.filter((p) => p.block === 2).map((p) => p.traySlot)).toEqual([6, 7, 8, 9, 10]);
  });

  it("addresses cell plots by first cell and leaves bed rows off the flats", () => {
    const cells = siteLayout({ ...base, plotUnit: "cells", plotSize: 12, entryCount: 3, blocks: 2 });
    expect(cells.map((p) => p.traySlot)).toEqual([1, 13, 25, 37, 49, 61]);
    const rows = siteLayout({ ...base, plotUnit: "bed_row", plotSize: 10 });
    expect(rows.every((p) => p.tray === null && p.traySlot === null)).toBe(true);
  });

  it("keeps a completely randomised layout in one block", () => {
    const crd = siteLayout({ ...base, design: "crd", blocks: 3, entryCount: 4 });
    expect(crd).toHaveLength(12);
    expect(crd.every((p) => p.block === 1)).toBe(true);
    expect(crd.map((p) => p.position)).toEqual(Array.from({ length: 12 }, (_, i) => i + 1));
  });
});
