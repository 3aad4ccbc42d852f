import type { Locale } from "@/lib/domain/vocabulary/enums";
import { differenceWithUnit, formatNumber, formatP, inShownUnit, isDays, numberInUnit, unitHeading, valueWithUnit, type UnitShape } from "@/lib/domain/analysis/format";
import type { Messages } from "./catalogue";

// Figures with their units as a reader of one language writes them: "6.9 on the 1-9 scale", "2,812 g per plot",
// "p = 0.034" in English; "6,9 en la escala 1-9", "2812 g por parcela", "p = 0,034" in Spanish. English goes
// through lib/domain/analysis/format.ts unchanged, so English pages, the PDF and exports read exactly as before.
// Light enough for client components (no catalogue here); server code takes `figuresOf(t)` from ./traits.

export type FigureKey = keyof Messages["figures"];

/** The words figures need: the `figures.*` messages and a unit in the reader's language. */
export interface FigureWords {
  figure: (key: FigureKey, values?: Record<string, string>) => string;
  unit: (unit: string) => string;
}

export interface Figures {
  locale: Locale;
  number: (x: number | null | undefined, digits?: number) => string;
  /** "p < 0.001", "p = 0.034", "p not available" */
  p: (p: number | null) => string;
  /** a percentage: "40%", "40 %" */
  percent: (x: number | null | undefined, digits?: number) => string;
  value: (trait: UnitShape, x: number | null | undefined, digits?: number) => string;
  difference: (trait: UnitShape, d: number | null | undefined, digits?: number) => string;
  heading: (trait: UnitShape) => string | null;
}

export function figuresFor(locale: Locale, words: FigureWords): Figures {
  const number = (x: number | null | undefined, digits?: number) => formatNumber(x, digits, locale);
  if (locale === "en") {
    return {
      locale,
      number,
      p: formatP,
      percent: (x, digits) => (x === null || x === undefined || !Number.isFinite(x) ? "–" : `${number(x, digits)}%`),
      value: valueWithUnit,
      difference: differenceWithUnit,
      heading: unitHeading,
    };
  }
  const { figure } = words;
  const unit = (u: string) => words.unit(u);
  return {
    locale,
    number,
    p: (p) => (p === null || !Number.isFinite(p) ? figure("pNone") : p < 0.001 ? figure("pBelow", { n: number(0.001, 3) }) : figure("pIs", { n: number(p, 3) })),
    percent: (x, digits) => (x === null || x === undefined || !Number.isFinite(x) ? "–" : figure("percent", { n: number(x, digits) })),
    value: (trait, x, digits) => {
      if (x === null || x === undefined || !Number.isFinite(x)) return "–";
      const n = numberInUnit(trait, x, digits, locale);
      if (isDays(trait)) return figure("days", { n });
      if (trait.valueType === "yes_no") return figure("yes", { n });
      if (trait.valueType === "rating") return trait.unit ? figure("onScale", { n, scale: trait.unit }) : n;
      return trait.unit ? figure("withUnit", { n, unit: unit(trait.unit) }) : n;
    },
    difference: (trait, d, digits) => {
      if (d === null || d === undefined || !Number.isFinite(d)) return "–";
      const n = formatNumber(inShownUnit(trait, d), digits ?? (trait.valueType === "yes_no" ? 0 : undefined), locale);
      if (isDays(trait)) return n === "1" ? figure("oneDay") : figure("days", { n });
      if (trait.valueType === "yes_no") return figure("percentagePoints", { n });
      if (trait.valueType === "rating") return trait.unit ? figure("pointsOnScale", { n, scale: trait.unit }) : figure("points", { n });
      return trait.unit ? figure("withUnit", { n, unit: unit(trait.unit) }) : n;
    },
    heading: (trait) => {
      if (isDays(trait)) return figure("daysHeading");
      if (trait.valueType === "yes_no") return figure("yesHeading");
      if (trait.valueType === "rating") return trait.unit ? figure("scaleHeading", { scale: trait.unit }) : null;
      return trait.unit ? unit(trait.unit) : null;
    },
  };
}
