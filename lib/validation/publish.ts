import { z } from "zod";
import { checkbox } from "./common";

const id = z.coerce.number({ error: "That is not a valid id." }).int().positive("That is not a valid id.");

export const publishSchema = z.object({
  trialId: id,
  traitId: z.preprocess((v) => (v === "" || v === "all" || v === undefined ? null : v), id.nullable()),
  siteModel: z.enum(["random", "fixed"], { error: "Choose whether sites are random or fixed." }),
  separation: z.enum(["lsd", "tukey"], { error: "Choose protected LSD or Tukey." }),
  mixed: checkbox.optional(),
  stabilityInReport: checkbox,
  changeNote: z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z.string().trim().max(2000, "Keep the change note under 2,000 characters.").optional(),
  ),
  // The sites the coordinator confirmed leaving out, as the ticked box names them ("3,7"); the server
  // publishes only when they are exactly the sites left out at that moment.
  confirmLeftOut: z.preprocess(
    (v) => (v === undefined || v === "" ? [] : v),
    z.union([
      z.array(id),
      z
        .string()
        .max(2000, "That list of sites is too long.")
        .regex(/^\d+(,\d+)*$/, "That list of sites is not valid. Reload the page.")
        .transform((s) => s.split(",").map(Number)),
    ]),
  ),
});

export const unpublishSchema = z.object({
  trialId: id,
  reason: z.string({ error: "Say why the results are withdrawn." }).trim().min(10, "Say why the results are withdrawn (at least 10 characters).").max(2000, "Keep the reason under 2,000 characters."),
});
