import type { TraitComputation, TraitType } from "@/lib/domain/vocabulary/enums";

// A trait recorded on scheduled days becomes one column per day (occasion = day after sowing); any other
// trait is a single column with occasion 0. Form fields, template headings and upload headings share this.

export interface TraitForColumns {
  id: number;
  code: string;
  name: string;
  unit: string | null;
  valueType: TraitType;
  minValue: number | null;
  maxValue: number | null;
  dueDaysAfterSowing: number[] | null;
  /** a once-recorded trait's due day after sowing; null when an event times it */
  dueByDay?: number | null;
  dueNote: string | null;
  /** How the analysis counts a date (from sowing or from transplanting); "none" when left out. */
  computation?: TraitComputation;
}

export interface EntryColumn {
  key: string;
  traitId: number;
  traitCode: string;
  occasion: number;
  name: string;
  unit: string | null;
  valueType: TraitType;
  min: number | null;
  max: number | null;
  /** Day after sowing the value falls due (a scheduled day, or a once-recorded trait's due-by day), or null for traits timed by an event ("at harvest"). */
  dueDay: number | null;
  dueNote: string | null;
  /** Which site date a date value is counted from in the analysis. */
  computation: TraitComputation;
  /** Heading in templates and uploads, e.g. "Seedlings emerged (count) day 5 [seedlings]". */
  heading: string;
}

/** Rating scales are 1-9 unless the trait says otherwise (common practice for quality scores). */
export const RATING_MIN = 1;
export const RATING_MAX = 9;

export function entryColumns(traits: TraitForColumns[]): EntryColumn[] {
  const out: EntryColumn[] = [];
  for (const t of traits) {
    const days = t.dueDaysAfterSowing && t.dueDaysAfterSowing.length > 0 ? t.dueDaysAfterSowing : null;
    const min = t.valueType === "rating" ? (t.minValue ?? RATING_MIN) : t.minValue;
    const max = t.valueType === "rating" ? (t.maxValue ?? RATING_MAX) : t.maxValue;
    const unit = t.unit && t.valueType !== "date" && t.valueType !== "yes_no" ? t.unit : null;
    for (const day of days ?? [0]) {
      const name = days ? `${t.name} day ${day}` : t.name;
      out.push({
        key: days ? `${t.code}@${day}` : t.code,
        traitId: t.id,
        traitCode: t.code,
        occasion: days ? day : 0,
        name,
        unit,
        valueType: t.valueType,
        min,
        max,
        dueDay: days ? day : (t.dueByDay ?? null),
        dueNote: days ? null : t.dueNote,
        computation: t.computation ?? "none",
        heading: unit ? `${name} [${unit}]` : name,
      });
    }
  }
  return out;
}

/** The range a grower sees under an input, e.g. "0–500 seedlings" or "1 (poor) to 9 (excellent)". */
export function describeRange(c: Pick<EntryColumn, "valueType" | "min" | "max" | "unit">): string {
  switch (c.valueType) {
    case "date":
      return "a date on or after sowing";
    case "yes_no":
      return "yes or no";
    case "text":
      return "a short note";
    case "rating":
      return `whole number ${c.min ?? RATING_MIN} to ${c.max ?? RATING_MAX}`;
    default: {
      const unit = c.unit ? ` ${c.unit}` : "";
      const kind = c.valueType === "count" ? "whole number " : "";
      if (c.min !== null && c.max !== null) return `${kind}${c.min} to ${c.max}${unit}`;
      if (c.min !== null) return `${kind}at least ${c.min}${unit}`;
      if (c.max !== null) return `${kind}at most ${c.max}${unit}`;
      return `${kind}number${unit}`.trim();
    }
  }
}

export const columnKey = (traitId: number, occasion: number, columns: EntryColumn[]) =>
  columns.find((c) => c.traitId === traitId && c.occasion === occasion)?.key ?? null;
