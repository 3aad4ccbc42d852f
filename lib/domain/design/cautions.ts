// Protocol cautions printed on every sheet. They point to the label and to local rules rather than
// prescribing products or electrical work, which Seedplot has no business advising on.

import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { localDueNote, localTraitName, localUnit } from "@/lib/domain/i18n/traits";

export interface CautionContext {
  /** blind codes whose packets hold treated seed */
  treatedCodes: readonly string[];
  plotUnit: "insert" | "cells" | "bed_row";
  growingSetup: "indoor_lights" | "greenhouse" | "high_tunnel" | "field";
}

export interface Caution {
  title: string;
  text: string;
}

/**
 * The cautions in the reader's language. Their wording lives in the catalogue ("cautions"); every language
 * keeps the same meaning: follow the label, keep treated seed from food and feed, local rules come first.
 */
export function cautionsFor(c: CautionContext, t: Translator = translatorFor()): Caution[] {
  const out: Caution[] = [];
  if (c.treatedCodes.length > 0) {
    out.push({ title: t("cautions.treatedTitle"), text: t("cautions.treatedText", { count: c.treatedCodes.length, codes: c.treatedCodes.join(", ") }) });
  }
  if (c.plotUnit !== "bed_row") out.push({ title: t("cautions.traysTitle"), text: t("cautions.traysText") });
  if (c.growingSetup === "indoor_lights" || c.growingSetup === "greenhouse" || c.plotUnit !== "bed_row") {
    out.push({ title: t("cautions.electricTitle"), text: t("cautions.electricText") });
  }
  out.push({ title: t("cautions.rulesTitle"), text: t("cautions.rulesText") });
  return out;
}

/** One column of the field data sheet: a trait on one scheduled day, or a trait recorded once. */
export interface SheetColumn {
  traitId: number;
  heading: string;
  /** Day after sowing, or null for traits timed by an event (first harvest, etc.). */
  day: number | null;
  when: string;
}

/** Lists what is recorded on each plot, in the trial's trait order (a scheduled count once per day, in place). */
export function sheetColumns(
  traits: { id: number; code: string; name: string; unit: string | null; dueDaysAfterSowing: number[] | null; dueNote: string | null }[],
  dueDate: (day: number) => string | null,
  words: Translator = translatorFor(),
): SheetColumn[] {
  const columns: SheetColumn[] = [];
  for (const t of traits) {
    const unitWord = localUnit(words, t.unit);
    const heading = `${localTraitName(words, t)}${unitWord ? ` (${unitWord})` : ""}`;
    if (t.dueDaysAfterSowing && t.dueDaysAfterSowing.length > 0) {
      for (const day of t.dueDaysAfterSowing) {
        const date = dueDate(day);
        columns.push({ traitId: t.id, heading, day, when: date ? words("sheets.dayDate", { day: String(day), date }) : words("sheets.day", { day: String(day) }) });
      }
    } else {
      columns.push({ traitId: t.id, heading, day: null, when: localDueNote(words, t) ?? words("sheets.whenItHappens") });
    }
  }
  return columns;
}
