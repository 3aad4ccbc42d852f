import { z } from "zod";

const id = z.coerce.number({ error: "That is not a valid id." }).int().positive("That is not a valid id.");

export const publishSchema = z.object({
  trialId: id,
  traitId: z.preprocess((v) => (v === "" || v === "all" || v === undefined ? null : v), id.nullable()),
  siteModel: z.enum(["random", "fixed"], { error: "Choose whether sites are random or fixed." }),
  separation: z.enum(["lsd", "tukey"], { error: "Choose protected LSD or Tukey." }),
  changeNote: z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z.string().trim().max(2000, "Keep the change note under 2,000 characters.").optional(),
  ),
});

export const unpublishSchema = z.object({
  trialId: id,
  reason: z.string({ error: "Say why the results are withdrawn." }).trim().min(10, "Say why the results are withdrawn (at least 10 characters).").max(2000, "Keep the reason under 2,000 characters."),
});
