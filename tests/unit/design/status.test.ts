import { describe, expect, it } from "vitest";
import { canEditDesign, canRandomiseSite, designLockReason, statusChangeProblem } from "@/lib/domain/design/status";

const base = { status: "draft" as const, randomisedSites: 0, observationCount: 0, entries: 4, traits: 2, sites: 2 };

describe("trial status rules", () => {
  it("freezes entries and design once any site is randomised", () => {
    expect(canEditDesign(base)).toBe(true);
    expect(canEditDesign({ ...base, randomisedSites: 1 })).toBe(false);
    expect(designLockReason({ ...base, randomisedSites: 1 })).toMatch(/frozen/);
    expect(canEditDesign({ ...base, status: "collecting" })).toBe(false);
  });

  it("allows re-randomising only until data exist", () => {
    expect(canRandomiseSite({ status: "open" }, 0)).toBe(true);
    expect(canRandomiseSite({ status: "open" }, 1)).toBe(false);
    expect(canRandomiseSite({ status: "analysing" }, 0)).toBe(false);
  });

  it("checks each step's preconditions", () => {
    expect(statusChangeProblem({ ...base, entries: 1 }, "open")).toMatch(/two entries/);
    expect(statusChangeProblem({ ...base, traits: 0 }, "open")).toMatch(/trait/);
    expect(statusChangeProblem(base, "open")).toBeNull();
    expect(statusChangeProblem({ ...base, status: "open", randomisedSites: 1 }, "collecting")).toMatch(/layout/);
    expect(statusChangeProblem({ ...base, status: "open", randomisedSites: 2 }, "collecting")).toBeNull();
    expect(statusChangeProblem(base, "published")).toMatch(/one step/);
    expect(statusChangeProblem({ ...base, status: "open", randomisedSites: 1 }, "draft")).toMatch(/cannot go back/);
  });
});
