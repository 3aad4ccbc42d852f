import { describe, expect, it } from "vitest";
import { defaultTraitOrder } from "@/lib/domain/vocabulary/traits";

const t = (id: number, code: string, valueType: string, dueDaysAfterSowing: number[] | null, dueByDay: number | null) => ({ id, code, valueType, dueDaysAfterSowing, dueByDay });

describe("default trait order", () => {
  it("puts seeds sown first, dated traits by their first due day, event-timed ones in the given order, notes last", () => {
    const traits = [
      t(1, "emergence_date", "date", null, 14),
      t(2, "marketable_yield", "number", null, null),
      t(3, "plot_notes", "text", null, null),
      t(4, "quality", "rating", null, null),
      t(5, "seeds_sown", "count", null, 0),
      t(6, "emergence_count", "count", [5, 7, 10, 14], null),
      t(7, "emerged_final", "count", null, 14),
    ];
    expect(defaultTraitOrder(traits).map((x) => x.code)).toEqual(["seeds_sown", "emergence_count", "emergence_date", "emerged_final", "marketable_yield", "quality", "plot_notes"]);
  });
});
