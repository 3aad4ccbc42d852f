import { describe, expect, it } from "vitest";
import { formatNumber, signedDifference } from "@/lib/domain/analysis/format";

// The staff analysis page (CheckCell) and the public means table show a variety's difference from the check;
// the same figure must read the same on both.
describe("a difference from the check", () => {
  it("that rounds to nothing reads ±0, with no decimals, whatever its size before rounding", () => {
    for (const x of [0, 0.004, -0.004, 0.0049, -0.00001]) expect([x, signedDifference(x)]).toEqual([x, "±0"]);
  });

  it("otherwise carries its sign and the decimals formatNumber gives its size", () => {
    expect(signedDifference(0.92)).toBe("+0.92");
    expect(signedDifference(-3.08)).toBe("−3.08");
    expect(signedDifference(0.006)).toBe("+0.01");
    expect(signedDifference(-12.34)).toBe("−12.3");
    expect(signedDifference(152.4)).toBe("+152");
    expect(signedDifference(-1234.5)).toBe(`−${formatNumber(1234.5)}`);
  });
});
