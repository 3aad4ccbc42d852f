import { z } from "zod";
import { GROWING_SETUPS, LOCALES, SITE_KINDS } from "@/lib/domain/vocabulary/enums";
import { id } from "./common";
import { optionalId, optionalNumber, optionalText, requiredText } from "./common";

export const siteSchema = z
  .object({
    // Left out when the viewer runs one program: the site then joins that program.
    programId: optionalId("Choose the program."),
    name: requiredText("the site name", 160, 2),
    kind: z.enum(SITE_KINDS, { error: "Choose farm or garden." }),
    region: requiredText("the county or region", 120),
    latitude: optionalNumber("Latitude must be a number from -90 to 90.", -90, 90),
    longitude: optionalNumber("Longitude must be a number from -180 to 180.", -180, 180),
    growingSetup: z.enum(GROWING_SETUPS, { error: "Choose the growing setup." }),
    soil: optionalText(160),
    irrigation: optionalText(160),
    cooperatorName: optionalText(120),
    cooperatorEmail: z.preprocess(
      (v) => (typeof v === "string" && v.trim() === "" ? undefined : typeof v === "string" ? v.trim().toLowerCase() : v),
      z.email({ error: "Enter an e-mail address like name@example.org." }).max(254).optional(),
    ),
  })
  .refine((v) => (v.latitude === undefined) === (v.longitude === undefined), { path: ["longitude"], message: "Give both latitude and longitude, or neither." })
  .refine((v) => !v.cooperatorEmail || !!v.cooperatorName, { path: ["cooperatorName"], message: "Enter the grower's name to invite them." });

/** The language a site's printouts are in; empty means the language of whoever prints them. */
export const sitePrintLanguageSchema = z.object({
  siteId: id("Choose a site."),
  printLocale: z.preprocess((v) => (v === "" ? null : v), z.enum(LOCALES, { error: "Choose English, Spanish or the reader's language." }).nullable()),
});
