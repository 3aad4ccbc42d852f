import { CATALOGUES, type Translator } from "./catalogue";
import { figuresFor, type Figures } from "./figures";

// Built-in traits are data (the `traits` table), but their names are trade terms a grower reads on every
// screen and sheet, so the catalogue carries them by code. A trait a coordinator made or renamed keeps the
// words it was given.

type BuiltIn = keyof typeof CATALOGUES.en.traits;
type Unit = keyof typeof CATALOGUES.en.units;

const builtIn = (code: string): code is BuiltIn => Object.hasOwn(CATALOGUES.en.traits, code);

/** The trait's name in the reader's language, when it is a built-in trait still under its catalogue name. */
export function localTraitName(t: Translator, trait: { code: string; name: string }): string {
  if (!builtIn(trait.code) || CATALOGUES.en.traits[trait.code].name !== trait.name) return trait.name;
  return t(`traits.${trait.code}.name`);
}

/** When an event-timed built-in trait is recorded ("At harvest"), in the reader's language. */
export function localDueNote(t: Translator, trait: { code: string; dueNote: string | null }): string | null {
  if (trait.dueNote === null || !builtIn(trait.code)) return trait.dueNote;
  const entry = CATALOGUES.en.traits[trait.code];
  if (!("due" in entry) || entry.due !== trait.dueNote) return trait.dueNote;
  return t(`traits.${trait.code}.due` as `traits.seeds_sown.due`);
}

/** A unit such as "seeds" or "g per plot" in the reader's language; units the catalogue lacks stay as written. */
export function localUnit(t: Translator, unit: string | null): string | null {
  if (unit === null || !Object.hasOwn(CATALOGUES.en.units, unit)) return unit;
  return t(`units.${unit as Unit}`);
}

/** Figures ("6,9 en la escala 1-9", "p = 0,034") in a server translator's language. */
export function figuresOf(t: Translator): Figures {
  return figuresFor(t.locale, { figure: (key, values) => t(`figures.${key}`, values), unit: (u) => localUnit(t, u) ?? u });
}

type AnalysedTrait = { code: string; name: string; unit: string | null; valueType: string; computation: string; analysedAs: string };

/**
 * A trait's name as analysed ("Days to emergence (days from sowing)") in the reader's language: the stored
 * English words in English, else the translated name with the same note of what was analysed.
 */
export function localAnalysedAs(t: Translator, trait: AnalysedTrait): string {
  if (t.locale === "en") return trait.analysedAs;
  const name = localTraitName(t, trait);
  if (trait.computation === "days_from_sowing" || (trait.valueType === "date" && trait.computation === "none")) return t("figures.analysedSowing", { name });
  if (trait.computation === "days_from_transplant") return t("figures.analysedTransplant", { name });
  if (trait.valueType === "yes_no") return t("figures.analysedShare", { name });
  if (trait.analysedAs === trait.name || !trait.unit) return name;
  return t("figures.analysedUnit", { name, unit: localUnit(t, trait.unit) ?? trait.unit });
}
