import type { TraitComputation, TraitType } from "@/lib/domain/vocabulary/enums";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { localDueNote, localTraitName, localUnit } from "@/lib/domain/i18n/traits";

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
  /**
   * Heading in templates and uploads, e.g. "Seedlings emerged (count) day 5 [seedlings]": always the stored
   * names, since an upload is read by its headings; `name`, `unit` and `dueNote` are in the reader's language.
   */
  heading: string;
}

/** Rating scales are 1-9 unless the trait says otherwise (common practice for quality scores). */
export const RATING_MIN = 1;
export const RATING_MAX = 9;

export function entryColumns(traits: TraitForColumns[], words?: Translator): EntryColumn[] {
  const out: EntryColumn[] = [];
  for (const t of traits) {
    const days = t.dueDaysAfterSowing && t.dueDaysAfterSowing.length > 0 ? t.dueDaysAfterSowing : null;
    const min = t.valueType === "rating" ? (t.minValue ?? RATING_MIN) : t.minValue;
    const max = t.valueType === "rating" ? (t.maxValue ?? RATING_MAX) : t.maxValue;
    const storedUnit = t.unit && t.valueType !== "date" && t.valueType !== "yes_no" ? t.unit : null;
    const unit = words ? localUnit(words, storedUnit) : storedUnit;
    const localName = words ? localTraitName(words, t) : t.name;
    for (const day of days ?? [0]) {
      const stored = days ? `${t.name} day ${day}` : t.name;
      const name = days ? (words ? words("columns.day", { name: localName, day: String(day) }) : stored) : localName;
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
        dueNote: days ? null : words ? localDueNote(words, t) : t.dueNote,
        computation: t.computation ?? "none",
        heading: storedUnit ? `${stored} [${storedUnit}]` : stored,
      });
    }
  }
  return out;
}

/** The range a grower sees under an input, e.g. "0–500 seedlings" or "1 (poor) to 9 (excellent)". */
export function describeRange(c: Pick<EntryColumn, "valueType" | "min" | "max" | "unit">, t: Translator = translatorFor()): string {
  switch (c.valueType) {
    case "date":
      return t("values.rangeDate");
    case "yes_no":
      return t("values.rangeYesNo");
    case "text":
      return t("values.rangeText");
    case "rating":
      return t("values.rangeRating", { min: String(c.min ?? RATING_MIN), max: String(c.max ?? RATING_MAX) });
    default: {
      const v = { whole: c.valueType === "count" ? "yes" : "no", min: String(c.min), max: String(c.max), unit: c.unit ? ` ${c.unit}` : "" };
      if (c.min !== null && c.max !== null) return t("values.rangeBetween", v);
      if (c.min !== null) return t("values.rangeAtLeast", v);
      if (c.max !== null) return t("values.rangeAtMost", v);
      return t("values.rangeAny", v).trim();
    }
  }
}

export const columnKey = (traitId: number, occasion: number, columns: EntryColumn[]) =>
  columns.find((c) => c.traitId === traitId && c.occasion === occasion)?.key ?? null;
