import { z } from "zod";
import { idParam } from "./common";

// What a coordinator types or picks to plan a trial's size; the page checks it before computing and
// the route checks the past trial it names.

export const planningSourceQuerySchema = z.object({
  from: idParam,
  trait: idParam,
});

const positive = (what: string, max: number) =>
  z.coerce
    .number({ error: `Enter ${what} as a number.` })
    .refine(Number.isFinite, `Enter ${what} as a number.`)
    .refine((x) => x > 0, `${what[0]!.toUpperCase()}${what.slice(1)} must be above 0.`)
    .refine((x) => x <= max, `${what[0]!.toUpperCase()}${what.slice(1)} must be at most ${max.toLocaleString("en-US")}.`);

/** A CV typed by hand: the difference is then a share of the mean. */
export const typedPlanSchema = z.object({
  cv: positive("the CV", 200),
  differencePercent: positive("the difference worth detecting", 500),
});

/** A CV taken from a past trial: the difference is in the trait's unit. */
export const pastTrialPlanSchema = z.object({
  difference: positive("the difference worth detecting", 1_000_000),
});
