/**
 * Turns recorded observations into the numbers an analysis uses: dates become days from the site's
 * sowing (or transplant) date, repeated counts use their last occasion, and anything not recorded
 * becomes a missing plot with its reason.
 */
import type { InputObservation, InputSite, InputTrait } from "./types";

const DAY_MS = 86_400_000;

/** Whole days from `from` to `to`, both ISO dates (YYYY-MM-DD), or null when either is absent. */
export function daysBetween(from: string | null, to: string | null): number | null {
  if (!from || !to) return null;
  const a = Date.parse(`${from}T00:00:00Z`);
  const b = Date.parse(`${to}T00:00:00Z`);
  if (!Number.isFinite(a) || !Number.isFinite(b)) return null;
  return Math.round((b - a) / DAY_MS);
}

/** Text traits cannot go into an ANOVA; every other type is analysed as a number (yes/no as 0/1). */
export function isAnalysable(trait: Pick<InputTrait, "valueType">): boolean {
  return trait.valueType !== "text";
}

/** How the analysed number is described to people, e.g. "First harvest date (days from sowing)". */
export function analysedAs(trait: InputTrait): string {
  if (trait.computation === "days_from_sowing" || (trait.valueType === "date" && trait.computation === "none")) return `${trait.name} (days from sowing)`;
  if (trait.computation === "days_from_transplant") return `${trait.name} (days from transplant)`;
  if (trait.valueType === "yes_no") return `${trait.name} (share of plots, 0–1)`;
  return trait.unit && !namesUnit(trait.name, trait.unit) ? `${trait.name} (${trait.unit})` : trait.name;
}

/** Whether a trait's name already says its unit ("Seedlings emerged (final)" in seedlings), so it is not said twice. */
function namesUnit(name: string, unit: string): boolean {
  const words = (text: string) => text.toLowerCase().match(/[a-z0-9-]+/g) ?? [];
  const stem = (w: string) => w.replace(/(es|s)$/, "");
  const nameStems = new Set(words(name).map(stem));
  const unitWords = words(unit);
  return unitWords.length > 0 && unitWords.every((w) => nameStems.has(stem(w)));
}

const REASON_WORDS: Record<string, string> = {
  not_sown: "not sown",
  died: "plants died",
  animal_damage: "animal damage",
  lost_label: "label lost",
  weather: "weather",
  other: "other reason",
};

/**
 * The analysed value of one plot for a trait, or null with the reason it is missing. With several
 * occasions (repeated counts) the last one is used, because it is the final stand.
 */
export function plotValue(
  trait: InputTrait,
  site: InputSite,
  observations: InputObservation[],
): { value: number | null; reason: string | null } {
  if (observations.length === 0) return { value: null, reason: "not recorded" };
  const last = observations.reduce((a, b) => (b.occasion > a.occasion ? b : a));
  if (last.missingReason) return { value: null, reason: REASON_WORDS[last.missingReason] ?? last.missingReason };
  if (trait.valueType === "date" || trait.computation !== "none") {
    const start = trait.computation === "days_from_transplant" ? site.transplantedOn : site.sownOn;
    if (!start) return { value: null, reason: trait.computation === "days_from_transplant" ? "site has no transplant date" : "site has no sowing date" };
    const days = daysBetween(start, last.valueDate);
    return days === null ? { value: null, reason: "no date recorded" } : { value: days, reason: null };
  }
  if (last.valueNumber === null) return { value: null, reason: "no value recorded" };
  return { value: last.valueNumber, reason: null };
}
