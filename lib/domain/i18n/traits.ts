import { CATALOGUES, type Translator } from "./catalogue";

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
