import { z } from "zod";

// Form fields arrive as strings: blank means "not given", numbers are coerced, ids are positive ints.

export const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

export const requiredText = (label: string, max: number, min = 1) =>
  z
    .string({ error: `Enter ${label}.` })
    .trim()
    .min(min, min > 1 ? `Enter ${label} (at least ${min} characters).` : `Enter ${label}.`)
    .max(max, `Use at most ${max} characters.`);

export const optionalText = (max: number) =>
  z.preprocess(blankToUndefined, z.string().trim().max(max, `Use at most ${max} characters.`).optional());

export const id = (message = "Choose an item from the list.") =>
  z.coerce.number({ error: message }).int(message).positive(message);

export const optionalId = (message = "Choose an item from the list.") => z.preprocess(blankToUndefined, id(message).optional());

export const optionalNumber = (message: string, min?: number, max?: number) => {
  let n = z.coerce.number({ error: message });
  if (min !== undefined) n = n.min(min, message);
  if (max !== undefined) n = n.max(max, message);
  return z.preprocess(blankToUndefined, n.optional());
};

export const checkbox = z.preprocess((v) => v === "on" || v === "true" || v === true, z.boolean());

export const isoDate = (message = "Enter a date like 2026-03-18.") =>
  z.string().regex(/^\d{4}-\d{2}-\d{2}$/, message).refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), message);

export const optionalIsoDate = (message?: string) => z.preprocess(blankToUndefined, isoDate(message).optional());

/** Route and page params: a positive integer id, or a 404-style refusal. */
export const idParam = z.coerce.number().int().positive();
