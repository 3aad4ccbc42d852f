import type { CropGroup, ExclusionCategory, GrowingSetup, PlotUnit, Role, TraitType, TrialDesign } from "@/lib/domain/vocabulary/enums";

export const ROLE_LABELS: Record<Role, string> = { admin: "Administrator", coordinator: "Coordinator", cooperator: "Partner grower" };

export const SETUP_LABELS: Record<GrowingSetup, string> = {
  indoor_lights: "Indoors under lights",
  greenhouse: "Greenhouse",
  high_tunnel: "High tunnel",
  field: "Field",
};

/** Formats an ISO date as e.g. "Tue 1 Dec 2026" without time-zone drift. */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return "—";
  const d = new Date(`${iso.slice(0, 10)}T00:00:00Z`);
  return d.toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
}

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
  bed_row: "Bed row of N plants",
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
