import { describe, expect, it } from "vitest";
import { parsePublishedAddress } from "@/lib/domain/publish/address";
import { isPublishableTrait } from "@/lib/domain/vocabulary/traits";

describe("public results addresses", () => {
  it("reads a trial code with or without a version", () => {
    expect(parsePublishedAddress("TV26-LET", undefined)).toEqual({ code: "TV26-LET", version: undefined });
    expect(parsePublishedAddress("TV26-LET", null)).toEqual({ code: "TV26-LET", version: undefined });
    expect(parsePublishedAddress("TV26-LET", "2")).toEqual({ code: "TV26-LET", version: 2 });
  });

  it("refuses a malformed code or version, so every caller answers the same 404", () => {
    for (const code of ["", "TV26 LET", "../x", "a".repeat(41), "TV26-LET'--"]) expect(parsePublishedAddress(code, undefined)).toBeNull();
    for (const version of ["0", "-1", "1.5", "abc", "100001", "1e400", "", "null"]) expect(parsePublishedAddress("TV26-LET", version)).toBeNull();
  });
});

describe("publishable traits", () => {
  it("offers every analysable trait except the seeds sown and text notes", () => {
    expect(isPublishableTrait({ code: "marketable_yield", valueType: "number" })).toBe(true);
    expect(isPublishableTrait({ code: "bolting", valueType: "yes_no" })).toBe(true);
    expect(isPublishableTrait({ code: "seeds_sown", valueType: "count" })).toBe(false);
    expect(isPublishableTrait({ code: "plot_notes", valueType: "text" })).toBe(false);
  });
});
