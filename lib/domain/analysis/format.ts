/** Number formatting shared by notes, tables and exports, so every place shows the same figures. */
import type { Locale } from "@/lib/domain/vocabulary/enums";

// Spanish pages write numbers the Spanish way (decimal comma), as the Spanish printouts do; files for machines stay English.
const NUMBER_LOCALES: Record<Locale, string> = { en: "en-US", es: "es" };

/** A p-value as people read it: "p < 0.001" or "p = 0.034". */
export function formatP(p: number | null): string {
  if (p === null || !Number.isFinite(p)) return "p not available";
  return p < 0.001 ? "p < 0.001" : `p = ${p.toFixed(3)}`;
}

/** A value with a sensible number of decimals for its size, in the reader's language ("2,812.5"; "2812,5"). */
export function formatNumber(x: number | null | undefined, digits?: number, locale: Locale = "en"): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  const d = digits ?? (Math.abs(x) >= 100 ? 0 : Math.abs(x) >= 10 ? 1 : 2);
  return numberFormat(d, locale).format(x);
}

// toLocaleString with options builds a new formatter on every call; an analysis formats thousands of numbers.
const numberFormats = new Map<string, Intl.NumberFormat>();
function numberFormat(digits: number, locale: Locale): Intl.NumberFormat {
  const key = `${locale}:${digits}`;
  let format = numberFormats.get(key);
  if (!format) {
    format = new Intl.NumberFormat(NUMBER_LOCALES[locale], { minimumFractionDigits: digits, maximumFractionDigits: digits });
    numberFormats.set(key, format);
  }
  return format;
}

/**
 * A difference (from the check) with its sign, as every table shows it: "+0.92", "−3.08", and "±0" for one
 * that rounds to nothing at the decimals its size gets, so "±0.00" and "−0.00" never appear. `format` writes
 * the magnitude in the page's language ("0,92").
 */
export function signedDifference(x: number, format: (magnitude: number) => string = formatNumber): string {
  const shown = format(Math.abs(x));
  return /[1-9]/.test(shown) ? `${x > 0 ? "+" : "−"}${shown}` : "±0";
}

/** CV% a well-run variety trial aims for (Ohio State SC-166; FarmWest: under 12% is "well-controlled"). */
export const CV_TARGET = 12;

/** "4 of 6 sites", "1 site". */
export function countOf(n: number, total: number, noun: string): string {
  return `${n} of ${total} ${total === 1 ? noun : `${noun}s`}`;
}

/** What `valueWithUnit` needs to know about a trait. */
export interface UnitShape {
  unit: string | null;
  valueType: string;
  computation: string;
}

export const isDays = (trait: UnitShape) => trait.computation !== "none" || trait.valueType === "date";

/**
 * The unit a column or axis of a trait's values is headed with: "days", "% yes", "1-9 scale", "g per plot",
 * or null when the trait has none. Numbers under it come from `inShownUnit`.
 */
export function unitHeading(trait: UnitShape): string | null {
  if (isDays(trait)) return "days";
  if (trait.valueType === "yes_no") return "% yes";
  if (trait.valueType === "rating") return trait.unit ? `${trait.unit} scale` : null;
  return trait.unit;
}

/** A value, difference, SE or LSD in the unit `unitHeading` names: a yes/no share (0-1) becomes a percentage. */
export function inShownUnit(trait: UnitShape, x: number): number;
export function inShownUnit(trait: UnitShape, x: number | null): number | null;
export function inShownUnit(trait: UnitShape, x: number | null): number | null {
  return x !== null && trait.valueType === "yes_no" ? 100 * x : x;
}

/**
 * Whether a CV means anything for the trait. Not for yes/no: the spread of 0/1 values over a small share
 * gives CVs of 200% that say nothing about the trial's precision, so the share of "yes" is shown instead.
 */
export function hasCv(trait: Pick<UnitShape, "valueType">): boolean {
  return trait.valueType !== "yes_no";
}

/** "CV 8.0%", or null when the trait has no CV (see `hasCv`). */
export function cvWords(cv: number | null): string | null {
  return cv === null || !Number.isFinite(cv) ? null : `CV ${formatNumber(cv, 1)}%`;
}

/** Decimals a trait's values are shown with: whole days to one decimal, % yes whole, ratings to one decimal. */
function valueDigits(trait: UnitShape): number | undefined {
  if (isDays(trait) || trait.valueType === "rating") return 1;
  if (trait.valueType === "yes_no") return 0;
  return undefined;
}

/** A value as a number under its `unitHeading` ("6.9", "2,812", "40" for 40% yes), with the decimals `valueWithUnit` uses. */
export function numberInUnit(trait: UnitShape, x: number | null | undefined, digits?: number, locale: Locale = "en"): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  // A least-squares mean of 0/1 values can fall just outside 0-1 when plots are missing; no share of
  // plots is below 0% or above 100%, so it is shown at the nearer end.
  const value = trait.valueType === "yes_no" ? Math.min(1, Math.max(0, x)) : x;
  return formatNumber(inShownUnit(trait, value), digits ?? valueDigits(trait), locale);
}

/**
 * A trait value as people write it: "6.9 on the 1-9 scale", "2,812 g per plot", "23.8 days", "40% yes".
 * Days are whole-day counts from sowing or transplanting, whatever the recorded unit ("date") says.
 */
export function valueWithUnit(trait: UnitShape, x: number | null | undefined, digits?: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  const n = numberInUnit(trait, x, digits);
  if (isDays(trait)) return `${n} days`;
  if (trait.valueType === "yes_no") return `${n}% yes`;
  if (trait.valueType === "rating") return trait.unit ? `${n} on the ${trait.unit} scale` : n;
  return trait.unit ? `${n} ${trait.unit}` : n;
}

/** What a difference between two values is counted in: "days", "percentage points", "points on the 1-9 scale", "g per plot". */
export function differenceUnit(trait: UnitShape): string | null {
  if (isDays(trait)) return "days";
  if (trait.valueType === "yes_no") return "percentage points";
  if (trait.valueType === "rating") return trait.unit ? `points on the ${trait.unit} scale` : "points";
  return trait.unit;
}

/**
 * A difference between two values (an LSD, a gap to the check) as people write it: "134 g per plot",
 * "0.48 days", "0.45 points on the 1-9 scale", "9 percentage points" for a yes/no share.
 */
export function differenceWithUnit(trait: UnitShape, d: number | null | undefined, digits?: number): string {
  if (d === null || d === undefined || !Number.isFinite(d)) return "–";
  const n = formatNumber(inShownUnit(trait, d), digits ?? (trait.valueType === "yes_no" ? 0 : undefined));
  const unit = differenceUnit(trait);
  if (unit === "days" && n === "1") return "1 day";
  return unit ? `${n} ${unit}` : n;
}
