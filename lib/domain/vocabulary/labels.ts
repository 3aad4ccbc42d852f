import type { Source as AnovaSource } from "@/lib/domain/stats/anova";
import type { CropGroup, ExclusionCategory, GrowingSetup, Locale, PlotUnit, Role, TraitType, TrialDesign } from "@/lib/domain/vocabulary/enums";

export const ROLE_LABELS: Record<Role, string> = { admin: "Administrator", coordinator: "Coordinator", cooperator: "Partner grower" };

export const SETUP_LABELS: Record<GrowingSetup, string> = {
  indoor_lights: "Indoors under lights",
  greenhouse: "Greenhouse",
  high_tunnel: "High tunnel",
  field: "Field",
};

/** BCP 47 tags for dates and numbers in each language Seedplot speaks. */
const DATE_LOCALES: Record<Locale, string> = { en: "en-US", es: "es" };

/**
 * The one way dates are shown to people (pages, PDFs, mails), in the reader's language: "May 3, 2026",
 * "3 may 2026". Takes an ISO date (YYYY-MM-DD, or a longer ISO timestamp whose day is used as written) or a
 * Date (its UTC day), so a calendar date never drifts by a time zone.
 */
export function formatDate(value: string | Date | null | undefined, locale: Locale = "en"): string {
  if (value === null || value === undefined || value === "") return "—";
  const iso = value instanceof Date ? value.toISOString() : value;
  const d = new Date(`${iso.slice(0, 10)}T00:00:00Z`);
  if (!Number.isFinite(d.getTime())) return "—";
  return d.toLocaleDateString(DATE_LOCALES[locale], { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
}

/** A moment with its time, in the same date format: "May 3, 2026, 14:05 UTC". */
export function formatDateTime(value: string | Date | null | undefined, locale: Locale = "en"): string {
  if (value === null || value === undefined || value === "") return "—";
  const d = value instanceof Date ? value : new Date(value);
  if (!Number.isFinite(d.getTime())) return "—";
  return `${formatDate(d, locale)}, ${d.toISOString().slice(11, 16)} UTC`;
}

/** Rows of an analysis of variance, named the same on the analysis page, in the PDF report and in exports. */
export const ANOVA_SOURCE_LABELS: Record<AnovaSource, string> = {
  site: "Site",
  block: "Block",
  "block:site": "Block within site",
  entry: "Variety",
  "entry:site": "Variety × site",
  residual: "Residual (error)",
};

export const CROP_GROUP_LABELS: Record<CropGroup, string> = {
  leafy_greens: "Leafy greens",
  brassicas: "Brassicas",
  legumes: "Legumes",
  roots: "Roots",
  alliums: "Alliums",
  fruiting: "Fruiting crops",
  herbs: "Herbs",
  flowers: "Flowers",
};

export const TRAIT_TYPE_LABELS: Record<TraitType, string> = {
  count: "Count",
  date: "Date",
  number: "Number",
  rating: "Rating 1–9",
  yes_no: "Yes / no",
  text: "Text",
};

export const COMPUTATION_LABELS = { none: "As recorded", days_from_sowing: "Days from sowing", days_from_transplant: "Days from transplanting" } as const;

export const DESIGN_LABELS: Record<TrialDesign, string> = {
  rcbd: "Randomised complete blocks",
  crd: "Completely randomised (e.g. germination chamber)",
};

export const PLOT_UNIT_LABELS: Record<PlotUnit, string> = {
  insert: "Six-cell insert in a flat",
  cells: "A number of cells",
  bed_row: "Bed row",
};

export const SITE_KIND_LABELS = { farm: "Farm", garden: "Garden" } as const;

/** The public reason for leaving a site or plot out of an analysis, in words a grower uses. */
export const EXCLUSION_CATEGORY_LABELS: Record<ExclusionCategory, string> = {
  plot_damaged: "plot damaged (animals, hail, flooding)",
  not_sown: "not sown, or sown late",
  seed_mix_up: "wrong seed or a seed mix-up",
  protocol_not_followed: "trial protocol not followed",
  site_data_incomplete: "site data incomplete",
  other: "other reason",
};
