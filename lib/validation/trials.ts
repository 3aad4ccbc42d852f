import { z } from "zod";
import { PLOT_UNITS, TRIAL_DESIGNS, TRIAL_STATUSES } from "@/lib/domain/vocabulary/enums";
import { checkbox, id, isoDate, optionalId, optionalIsoDate, optionalText, requiredText } from "./common";

/** Trait checkboxes are named `trait_<id>`; they are gathered into one ordered list. */
const withTraitIds = (v: unknown) => {
  if (!v || typeof v !== "object") return v;
  const traitIds = Object.entries(v as Record<string, unknown>)
    .filter(([k, val]) => /^trait_\d+$/.test(k) && (val === "on" || val === "true"))
    .map(([k]) => Number(k.slice(6)));
  return { ...(v as object), traitIds };
};

const designFields = {
  title: requiredText("a title", 200, 3),
  purpose: optionalText(2000),
  design: z.enum(TRIAL_DESIGNS, { error: "Choose a design." }),
  blocks: z.coerce
    .number({ error: "Enter the number of blocks." })
    .int("The number of blocks must be a whole number.")
    .min(1, "A trial needs at least one block (four or more are usual).")
    .max(12, "Use at most 12 blocks per site."),
  plotUnit: z.enum(PLOT_UNITS, { error: "Choose the plot unit." }),
  plotSize: z.coerce
    .number({ error: "Enter the plot size." })
    .int("The plot size must be a whole number.")
    .min(1, "A plot needs at least one cell or plant.")
    .max(500, "Use at most 500 cells or plants per plot."),
  seedsPerCell: z.coerce
    .number({ error: "Enter the seeds per cell." })
    .int("Seeds per cell must be a whole number.")
    .min(1, "Sow at least one seed per cell.")
    .max(10, "Use at most 10 seeds per cell."),
  protocol: optionalText(5000),
  traitIds: z.array(z.number().int().positive()).max(40, "Choose at most 40 traits."),
};

const plotRule = <T extends { plotUnit: string; plotSize: number; design: string; blocks: number }>(s: z.ZodType<T>) =>
  s
    .refine((v) => v.plotUnit !== "insert" || v.plotSize === 6, { path: ["plotSize"], message: "A six-cell insert plot has 6 cells." })
    .refine((v) => v.plotUnit !== "cells" || v.plotSize <= 72, { path: ["plotSize"], message: "A cell plot must fit in one 72-cell flat." })
    .refine((v) => v.design !== "crd" || v.blocks >= 1, { path: ["blocks"], message: "Enter the number of replicates." });

export const createTrialSchema = z.preprocess(
  withTraitIds,
  plotRule(
    z.object({
      seasonId: id("Choose the season."),
      cropId: id("Choose the crop."),
      code: z
        .string({ error: "Enter a short trial code." })
        .trim()
        .toUpperCase()
        .regex(/^[A-Z0-9][A-Z0-9-]{2,39}$/, "Use 3–40 letters, digits or dashes, e.g. W27-KALE."),
      ...designFields,
    }),
  ),
);

export const updateTrialSchema = z.preprocess(withTraitIds, plotRule(z.object({ trialId: id(), ...designFields })));

export const addEntrySchema = z.object({
  trialId: id(),
  varietyId: id("Choose the variety."),
  seedLotId: optionalId("Choose a seed lot of this variety."),
  isCheck: checkbox,
});

export const removeEntrySchema = z.object({ trialId: id(), entryId: id() });

export const enrolSiteSchema = z.object({
  trialId: id(),
  siteId: id("Choose the site."),
  sownOn: optionalIsoDate("Enter the sowing date like 2027-03-18."),
  namedInResults: checkbox,
});

export const sowingDateSchema = z.object({
  trialId: id(),
  siteId: id(),
  sownOn: z.preprocess((v) => v ?? "", isoDate("Enter the sowing date like 2027-03-18.")),
});

export const randomiseSchema = z.object({ trialId: id(), siteId: id() });

export const changeStatusSchema = z.object({ trialId: id(), status: z.enum(TRIAL_STATUSES, { error: "Choose a status." }) });

export const sheetKindSchema = z.enum(["map", "labels", "sheet", "packing"], { error: "Ask for a map, labels, a data sheet or a packing list." });

export const pageSizeSchema = z.enum(["LETTER", "A4"]).default("LETTER");

/** Plan the next season from a trial: the season, a new code and a title. */
export const rollForwardSchema = z.object({
  trialId: id(),
  seasonId: id("Choose the season."),
  code: z
    .string({ error: "Enter a short trial code." })
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{2,39}$/, "Use 3–40 letters, digits or dashes, e.g. W28-KALE."),
  title: requiredText("a title", 200, 3),
});

/** Move one of a trial's traits up or down its order. */
export const moveTraitSchema = z.object({
  trialId: id(),
  traitId: id("Choose a trait."),
  direction: z.enum(["up", "down"], { error: "Move a trait up or down." }),
});

/** Whether the site's grower agreed to be named in public results. */
export const siteNamingSchema = z.object({
  trialId: id(),
  siteId: id("Choose the site."),
  named: z.enum(["1", "0"], { error: "Say whether the site may be named." }).transform((v) => v === "1"),
});

/** This season's seed lot for one entry. */
export const entryLotSchema = z.object({ trialId: id(), entryId: id(), seedLotId: id("Choose a seed lot of this variety.") });
