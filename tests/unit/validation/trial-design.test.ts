import { describe, expect, it } from "vitest";
import { createTrialSchema, addEntrySchema } from "@/lib/validation/trials";
import { seedLotSchema, traitSchema } from "@/lib/validation/catalogue";
import { siteSchema } from "@/lib/validation/sites";

const trial = { seasonId: "1", cropId: "2", code: "tv27-kal", title: "Kale", design: "rcbd", blocks: "4", plotUnit: "insert", plotSize: "6", seedsPerCell: "1" };
const messages = (r: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  Object.fromEntries((r.error?.issues ?? []).map((i) => [String(i.path[0]), i.message]));

describe("trial form", () => {
  it("gathers ticked trait boxes and normalises the code", () => {
    const parsed = createTrialSchema.parse({ ...trial, trait_7: "on", trait_3: "on", trait_9: "" });
    expect(parsed.traitIds).toEqual([7, 3]);
    expect(parsed.code).toBe("TV27-KAL");
  });

  it("explains zero blocks, a wrong insert size and an oversized cell plot", () => {
    expect(messages(createTrialSchema.safeParse({ ...trial, blocks: "0" })).blocks).toMatch(/at least one block/);
    expect(messages(createTrialSchema.safeParse({ ...trial, plotSize: "8" })).plotSize).toMatch(/6 cells/);
    expect(messages(createTrialSchema.safeParse({ ...trial, plotUnit: "cells", plotSize: "80" })).plotSize).toMatch(/72-cell flat/);
  });

  it("reads an unticked check box as false", () => {
    expect(addEntrySchema.parse({ trialId: "1", varietyId: "2", seedLotId: "" })).toEqual({ trialId: 1, varietyId: 2, seedLotId: undefined, isCheck: false });
  });
});

describe("catalogue forms", () => {
  it("refuses a trait whose lowest value is above its highest", () => {
    expect(messages(traitSchema.safeParse({ name: "Height", code: "height", valueType: "number", minValue: "30", maxValue: "5" })).maxValue).toMatch(/not be below/);
  });

  it("parses due days and refuses day computations on non-dates", () => {
    expect(traitSchema.parse({ name: "Emerged", code: "emerged", valueType: "count", dueDaysAfterSowing: "14, 5,7, 10, 7" }).dueDaysAfterSowing).toEqual([5, 7, 10, 14]);
    expect(messages(traitSchema.safeParse({ name: "Emerged", code: "emerged", valueType: "count", dueDaysAfterSowing: "five" })).dueDaysAfterSowing).toMatch(/whole numbers/);
    expect(messages(traitSchema.safeParse({ name: "Height", code: "height", valueType: "number", computation: "days_from_sowing" })).computation).toMatch(/Only a date/);
  });

  it("keeps 'not stated' germination empty and asks for the treatment of treated seed", () => {
    const lot = { varietyId: "1", source: "Hollowtree", lotCode: "A1", labelGerminationPct: "" };
    expect(seedLotSchema.parse(lot).labelGerminationPct).toBeUndefined();
    expect(messages(seedLotSchema.safeParse({ ...lot, labelGerminationPct: "105" })).labelGerminationPct).toMatch(/0 to 100/);
    expect(messages(seedLotSchema.safeParse({ ...lot, treated: "on" })).treatment).toMatch(/seed tag/);
  });

  it("wants both coordinates or neither, and a name with a grower's e-mail", () => {
    const site = { name: "Hilltop", kind: "farm", region: "North", growingSetup: "field" };
    expect(siteSchema.safeParse(site).success).toBe(true);
    expect(messages(siteSchema.safeParse({ ...site, latitude: "45.1" })).longitude).toMatch(/both/);
    expect(messages(siteSchema.safeParse({ ...site, cooperatorEmail: "a@b.example" })).cooperatorName).toMatch(/grower's name/);
  });
});
