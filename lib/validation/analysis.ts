import { z } from "zod";
import { BETTER_WHEN } from "@/lib/domain/vocabulary/enums";
import { idParam } from "./common";
import { EXCLUSION_CATEGORIES } from "@/lib/domain/vocabulary/enums";
import { ACROSS_SEASONS_CSV_TABLES } from "@/lib/domain/analysis/across-seasons-export";

// Analysis settings arrive as URL search parameters (the page's controls and outside tools alike).

const flag = z.enum(["1", "0", "true", "false"]).transform((v) => v === "1" || v === "true");

export const analysisQuerySchema = z.object({
  trait: idParam.optional(),
  sites: z
    .string()
    .regex(/^\d+(,\d+)*$/, "List sites as ids separated by commas.")
    .transform((s) => [...new Set(s.split(",").map(Number))])
    .optional(),
  unaccepted: flag.optional(),
  model: z.enum(["random", "fixed"], { error: "Sites must be random or fixed." }).optional(),
  compare: z.enum(["lsd", "tukey"], { error: "Compare means with lsd or tukey." }).optional(),
  // the REML mixed model beside the least-squares analysis (staff only)
  mixed: flag.optional(),
  // Not a setting: asks the JSON API to add every plot's value, which the page itself never needs.
  plots: flag.optional(),
  // Not a setting either: asks for the analysis page's slim first view (lib/domain/analysis/page-view), what the page refetches.
  page: flag.optional(),
});

export type AnalysisQuery = z.infer<typeof analysisQuerySchema>;

/** Reads URL search parameters into analysis settings, with a plain message on the first problem. */
export function parseAnalysisQuery(search: URLSearchParams): { ok: true; data: AnalysisQuery } | { ok: false; message: string } {
  const raw: Record<string, string> = {};
  for (const key of ["trait", "sites", "unaccepted", "model", "compare", "mixed", "plots", "page"]) {
    const v = search.get(key);
    if (v !== null && v !== "") raw[key] = v;
  }
  const parsed = analysisQuerySchema.safeParse(raw);
  if (parsed.success) return { ok: true, data: parsed.data };
  const issue = parsed.error.issues[0]!;
  const field = String(issue.path[0] ?? "settings");
  const message = field === "trait" ? "The trait must be a trait id from this trial." : field === "unaccepted" || field === "plots" || field === "mixed" || field === "page" ? `${field} must be 1 or 0.` : issue.message;
  return { ok: false, message };
}

export const exclusionSchema = z
  .object({
    trialId: z.coerce.number().int().positive(),
    target: z.string().regex(/^(site:\d+|plot:\d+|plot)$/, "Choose a site, or one plot, to exclude."),
    plotCode: z.string().trim().max(24, "Plot codes are at most 24 characters.").optional(),
    traitId: z.preprocess((v) => (v === "" || v === "all" ? undefined : v), z.coerce.number().int().positive().optional()),
    category: z.enum(EXCLUSION_CATEGORIES, { error: "Choose the reason the public will read." }),
    note: z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.string().trim().max(500, "Keep the note under 500 characters.").optional()),
  })
  .superRefine((v, ctx) => {
    if (v.target === "plot" && !v.plotCode) {
      ctx.addIssue({ code: "custom", path: ["plotCode"], message: "Type the code printed on the plot's label, e.g. S1-B2-03." });
    }
    if (v.category === "other" && !v.note) {
      ctx.addIssue({ code: "custom", path: ["note"], message: "With \"other reason\", say in the note what happened, so your colleagues know." });
    }
  })
  .transform((v) => {
    const [kind, id] = v.target.split(":");
    const byCode = v.target === "plot";
    return {
      trialId: v.trialId,
      traitId: v.traitId ?? null,
      category: v.category,
      note: v.note ?? null,
      siteId: kind === "site" ? Number(id) : null,
      plotId: kind === "plot" && !byCode ? Number(id) : null,
      plotCode: byCode ? v.plotCode!.toUpperCase() : null,
    };
  });

export const removeExclusionSchema = z.object({ trialId: z.coerce.number().int().positive(), exclusionId: z.coerce.number().int().positive() });

export const shareResultsSchema = z.object({
  trialId: z.coerce.number().int().positive(),
  siteId: z.coerce.number({ error: "Choose a site." }).int().positive("Choose a site."),
  shared: z.enum(["1", "0"]).transform((v) => v === "1"),
});

/** Which way is better for one of a trial's traits; "default" goes back to the trait library's. */
export const traitDirectionSchema = z.object({
  trialId: z.coerce.number().int().positive(),
  traitId: z.coerce.number({ error: "Choose a trait." }).int().positive("Choose a trait."),
  betterWhen: z.enum([...BETTER_WHEN, "default"], { error: "Choose higher is better, lower is better, or no preference." }).transform((v) => (v === "default" ? null : v)),
});

/** The across-seasons view's address: a crop id and a trait code (the same trait in every season). */
const acrossSeasonsTrait = z.string().trim().regex(/^[a-z0-9_]{1,40}$/i, "Choose a trait from the list.");

export const acrossSeasonsQuerySchema = z.object({
  crop: idParam.optional(),
  trait: acrossSeasonsTrait.optional(),
});

/** A download of the across-seasons view: its crop and trait, and which file (an .xlsx, or one table as CSV). */
export const acrossSeasonsExportSchema = z.object({
  crop: idParam,
  trait: acrossSeasonsTrait,
  format: z.enum(["xlsx", "csv"], { error: "Ask for format xlsx or csv." }).default("xlsx"),
  table: z.enum(ACROSS_SEASONS_CSV_TABLES, { error: `Ask for table ${ACROSS_SEASONS_CSV_TABLES.join(", ")}.` }).default("means"),
});
