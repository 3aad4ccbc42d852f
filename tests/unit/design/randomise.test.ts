import { describe, expect, it } from "vitest";
import { randomiseBlocks, randomiseCompletely } from "@/lib/domain/design/randomise";
import { BLIND_CODE_ALPHABET, blindCodes, isBlindCode } from "@/lib/domain/design/blind-codes";

describe("randomised complete blocks", () => {
  it("places every entry exactly once per block", () => {
    for (const seed of [1, 42, 20261201, 4294967295]) {
      const plots = randomiseBlocks({ entryCount: 7, blocks: 5, seed });
      expect(plots).toHaveLength(35);
      for (let b = 1; b <= 5; b += 1) {
        const inBlock = plots.filter((p) => p.block === b);
        expect(inBlock.map((p) => p.entryIndex).sort()).toEqual([0, 1, 2, 3, 4, 5, 6]);
        expect(inBlock.map((p) => p.position)).toEqual([1, 2, 3, 4, 5, 6, 7]);
      }
    }
  });

  it("gives the same layout for the same seed and different layouts for different sites' seeds", () => {
    const a = randomiseBlocks({ entryCount: 6, blocks: 4, seed: 1234 });
    expect(randomiseBlocks({ entryCount: 6, blocks: 4, seed: 1234 })).toEqual(a);
    const layouts = new Set([1, 2, 3, 4, 5].map((seed) => JSON.stringify(randomiseBlocks({ entryCount: 6, blocks: 4, seed }))));
    expect(layouts.size).toBe(5);
  });

  it("a completely randomised design holds every entry once per replicate", () => {
    const plots = randomiseCompletely({ entryCount: 5, replicates: 4, seed: 9 });
    expect(plots).toHaveLength(20);
    for (let e = 0; e < 5; e += 1) expect(plots.filter((p) => p.entryIndex === e)).toHaveLength(4);
  });
});

describe("blind codes", () => {
  it("are unique, three characters, from the unambiguous alphabet", () => {
    const codes = blindCodes(60, 77);
    expect(new Set(codes).size).toBe(60);
    expect(codes.every(isBlindCode)).toBe(true);
    for (const confusable of ["0", "O", "1", "I", "L", "2", "Z", "5", "S", "8", "B", "U", "V"]) expect(BLIND_CODE_ALPHABET).not.toContain(confusable);
  });

  it("never reuse a code already given in the trial", () => {
    const first = blindCodes(30, 5);
    for (let seed = 0; seed < 50; seed += 1) expect(first).not.toContain(blindCodes(1, seed, first)[0]);
  });
});
