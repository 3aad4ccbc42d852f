import { describe, expect, it } from "vitest";
import { missingPlotList } from "@/lib/domain/observations/missing";

describe("the report's list of missing plots", () => {
  it("names a plot once even when two traits give it different reasons, and keeps plots of the same code at two sites apart", () => {
    const list = missingPlotList([
      { plotCode: "S01-1-03", siteName: "Willow Bend Farm", reason: "not sown" },
      { plotCode: "S01-1-03", siteName: "Willow Bend Farm", reason: "plants died" },
      { plotCode: "S01-1-03", siteName: "Willow Bend Farm", reason: "not sown" },
      { plotCode: "S01-1-03", siteName: "Larkspur Acres", reason: "not sown" },
    ]);
    expect(list).toBe("S01-1-03 (Willow Bend Farm, not sown / plants died); S01-1-03 (Larkspur Acres, not sown)");
  });
});
