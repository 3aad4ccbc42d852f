import type { EntryColumn } from "./columns";
import { missingCell, parseMissingText, type MissingReason } from "./missing";
import { SEEDS_SOWN_CODE, EMERGED_TRAIT_CODES } from "@/lib/domain/vocabulary/traits";
import { siteDateRefusal } from "./date-order";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

// Turning what a grower typed (or a spreadsheet cell) into a stored value, with messages a grower
// understands. Pure, so the browser gives the same answer as the server, which always re-checks.

export interface CellValue {
  valueNumber: number | null;
  valueDate: string | null;
  valueText: string | null;
}

export type ParseResult = { ok: true; value: CellValue | null } | { ok: false; message: string };

/**
 * How a number written as text with a comma ("12,5") is read: as a decimal comma where that is how the
 * grower types (a form field, a CSV), or asked about where the grower's own spreadsheet program did not take
 * it for a number (a text cell in a workbook), since the comma may then separate thousands.
 */
export type TextNumberCommas = "decimal" | "ask";

export interface ParseContext {
  /** The site's sowing date (YYYY-MM-DD); dates before it are refused. */
  sownOn: string | null;
  /** The site's transplanting date, if any; dates counted from it are refused before it. */
  transplantedOn?: string | null;
  /** Today (YYYY-MM-DD); observation dates after it are refused. */
  today: string;
  /** Default "decimal". */
  textNumberCommas?: TextNumberCommas;
  /** The grower's language for messages; English when absent. */
  t?: Translator;
}

export const MAX_TEXT = 1000;

const MONTHS = ["january", "february", "march", "april", "may", "june", "july", "august", "september", "october", "november", "december"];
const MONTH_NAMES = MONTHS.map((m) => m[0]!.toUpperCase() + m.slice(1));

const num = (n: number): CellValue => ({ valueNumber: n, valueDate: null, valueText: null });
const fail = (message: string): ParseResult => ({ ok: false, message });

function isoFromParts(y: number, m: number, d: number): string | null {
  if (m < 1 || m > 12 || d < 1 || d > 31 || y < 1900 || y > 2200) return null;
  const date = new Date(Date.UTC(y, m - 1, d));
  if (date.getUTCMonth() !== m - 1 || date.getUTCDate() !== d) return null;
  return date.toISOString().slice(0, 10);
}

const spoken = (iso: string, t: Translator) => {
  const [y, m, d] = iso.split("-").map(Number);
  if (t.locale === "en") return `${d} ${MONTH_NAMES[m! - 1]} ${y}`;
  return new Date(Date.UTC(y!, m! - 1, d)).toLocaleDateString(t.locale, { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });
};

/**
 * Reads a date typed in any common unambiguous way. Day/month order is only guessed when one of the two
 * numbers is above 12; "03/04/2026" could be either, so the grower is asked to write it as YYYY-MM-DD.
 */
export function parseDateText(raw: string, t: Translator = translatorFor()): { ok: true; iso: string } | { ok: false; message: string } {
  const s = raw.trim().replace(/\s+/g, " ");
  const bad = { ok: false as const, message: t("values.notADate", { raw }) };
  let m = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})$/.exec(s);
  if (m) {
    const iso = isoFromParts(+m[1]!, +m[2]!, +m[3]!);
    return iso ? { ok: true, iso } : bad;
  }
  m = /^(\d{1,2})[-/.](\d{1,2})[-/.](\d{2}|\d{4})$/.exec(s);
  if (m) {
    if (m[3]!.length === 2) return { ok: false, message: t("values.twoDigitYear", { raw }) };
    const a = +m[1]!;
    const b = +m[2]!;
    const y = +m[3]!;
    if (a <= 12 && b <= 12 && a !== b) {
      const dayFirst = isoFromParts(y, b, a);
      const monthFirst = isoFromParts(y, a, b);
      if (dayFirst && monthFirst) {
        return { ok: false, message: t("values.ambiguousDate", { raw, dayFirst: spoken(dayFirst, t), monthFirst: spoken(monthFirst, t), dayFirstIso: dayFirst, monthFirstIso: monthFirst }) };
      }
    }
    const iso = a > 12 ? isoFromParts(y, b, a) : b > 12 ? isoFromParts(y, a, b) : isoFromParts(y, b, a);
    return iso ? { ok: true, iso } : bad;
  }
  // "4 March 2026", "4 Mar 2026", "March 4, 2026", "Mar 4 2026"
  const monthIndex = (word: string) => {
    const w = word.toLowerCase().replace(/\.$/, "");
    if (w.length < 3) return -1;
    return MONTHS.findIndex((name) => name.startsWith(w));
  };
  m = /^(\d{1,2}) ([A-Za-z.]+),? (\d{4})$/.exec(s);
  if (m && monthIndex(m[2]!) >= 0) {
    const iso = isoFromParts(+m[3]!, monthIndex(m[2]!) + 1, +m[1]!);
    return iso ? { ok: true, iso } : bad;
  }
  m = /^([A-Za-z.]+) (\d{1,2}),? (\d{4})$/.exec(s);
  if (m && monthIndex(m[1]!) >= 0) {
    const iso = isoFromParts(+m[3]!, monthIndex(m[1]!) + 1, +m[2]!);
    return iso ? { ok: true, iso } : bad;
  }
  return bad;
}

/**
 * Reads a number typed with a point or a decimal comma ("12,5"). A comma followed by exactly three
 * digits ("1,250") could be a thousands separator or a decimal comma, so it is refused with both readings.
 * With commas "ask" (a workbook's text cell), any comma is refused that way.
 */
export function parseNumberText(raw: string, commas: TextNumberCommas = "decimal", t: Translator = translatorFor()): { ok: true; n: number } | { ok: false; message: string } {
  const s = raw.trim().replace(/\s/g, "");
  if (/^[+-]?\d+(\.\d+)?$/.test(s)) return { ok: true, n: Number(s) };
  if (/^[+-]?\.\d+$/.test(s)) return { ok: true, n: Number(s) };
  const comma = /^([+-]?\d+),(\d+)$/.exec(s);
  if (comma && commas === "ask") {
    return {
      ok: false,
      message: t("values.commaAsText", { raw: raw.trim(), decimal: `${comma[1]}.${comma[2]}` }),
    };
  }
  if (comma) {
    if (comma[2]!.length === 3) {
      return { ok: false, message: t("values.commaAmbiguous", { raw, thousands: `${comma[1]}${comma[2]}`, decimal: `${comma[1]}.${comma[2]}` }) };
    }
    return { ok: true, n: Number(`${comma[1]}.${comma[2]}`) };
  }
  return { ok: false, message: t("values.notANumber", { raw }) };
}

function checkRange(c: EntryColumn, n: number, t: Translator): string | null {
  // Numbers go in as typed text so the message shows them exactly as the grower wrote them.
  const unit = c.unit ? ` ${c.unit}` : "";
  const v = { n: String(n), min: String(c.min), max: String(c.max), unit };
  if (c.valueType === "rating") {
    if (!Number.isInteger(n) || (c.min !== null && n < c.min) || (c.max !== null && n > c.max)) {
      return t("values.ratingRange", { ...v, min: String(c.min ?? 1), max: String(c.max ?? 9) });
    }
    return null;
  }
  if (c.valueType === "count" && !Number.isInteger(n)) return t("values.notWhole", v);
  if (c.min !== null && n < c.min) return c.max !== null ? t("values.outsideRange", v) : t("values.belowMin", v);
  if (c.max !== null && n > c.max) return c.min !== null ? t("values.outsideRange", v) : t("values.aboveMax", v);
  return null;
}

function dateFromSheet(d: Date): string {
  return d.toISOString().slice(0, 10);
}

/** Parses one value for one column. A blank value parses to null (it clears the value). */
export function parseCell(c: EntryColumn, raw: unknown, ctx: ParseContext): ParseResult {
  const t = ctx.t ?? translatorFor();
  if (raw === null || raw === undefined) return { ok: true, value: null };
  if (typeof raw === "string" && raw.trim() === "") return { ok: true, value: null };

  switch (c.valueType) {
    case "count":
    case "number":
    case "rating": {
      let n: number;
      if (typeof raw === "number") n = raw;
      else if (typeof raw === "string") {
        const parsed = parseNumberText(raw, ctx.textNumberCommas, t);
        if (!parsed.ok) return fail(parsed.message);
        n = parsed.n;
      } else if (raw instanceof Date) return fail(t("values.dateNotNumber"));
      else return fail(t("values.numberHere"));
      if (!Number.isFinite(n)) return fail(t("values.numberHere"));
      const problem = checkRange(c, n, t);
      return problem ? fail(problem) : { ok: true, value: num(n) };
    }
    case "date": {
      let iso: string;
      if (raw instanceof Date) {
        if (Number.isNaN(raw.getTime())) return fail(t("values.unreadableDate"));
        iso = dateFromSheet(raw);
      } else if (typeof raw === "string") {
        const parsed = parseDateText(raw, t);
        if (!parsed.ok) return fail(parsed.message);
        iso = parsed.iso;
      } else return fail(t("values.notADateValue", { raw: String(raw) }));
      const refusal = siteDateRefusal(c, iso, { sownOn: ctx.sownOn, transplantedOn: ctx.transplantedOn ?? null }, t);
      if (refusal) return fail(refusal);
      if (iso > ctx.today) return fail(t("values.future", { iso }));
      return { ok: true, value: { valueNumber: null, valueDate: iso, valueText: null } };
    }
    case "yes_no": {
      const s = String(raw).trim().toLowerCase();
      if (["yes", "y", "1", "true", "sí", "si", "s"].includes(s)) return { ok: true, value: num(1) };
      if (["no", "n", "0", "false"].includes(s)) return { ok: true, value: num(0) };
      return fail(t("values.notYesNo", { raw: String(raw) }));
    }
    case "text": {
      const s = raw instanceof Date ? dateFromSheet(raw) : String(raw).trim();
      if (s.length > MAX_TEXT) return fail(t("values.noteTooLong", { length: String(s.length), max: String(MAX_TEXT) }));
      return { ok: true, value: { valueNumber: null, valueDate: null, valueText: s } };
    }
  }
}

/**
 * Checks between values of one plot: seedlings emerged can never exceed seeds sown. Problems are
 * reported on the changed value, so the grower sees the message where they just typed.
 */
export function crossCheckPlot(columns: EntryColumn[], values: Map<string, CellValue | null>, changed: Set<string>, t: Translator = translatorFor()): { key: string; message: string }[] {
  const sownCol = columns.find((c) => c.traitCode === SEEDS_SOWN_CODE);
  const sown = sownCol ? values.get(sownCol.key)?.valueNumber ?? null : null;
  if (sown === null || !sownCol) return [];
  const out: { key: string; message: string }[] = [];
  for (const c of columns) {
    if (!EMERGED_TRAIT_CODES.includes(c.traitCode)) continue;
    const emerged = values.get(c.key)?.valueNumber ?? null;
    if (emerged === null || emerged <= sown) continue;
    const message = t("values.emergedOverSown", { emerged: String(emerged), sown: String(sown) });
    if (changed.has(c.key)) out.push({ key: c.key, message });
    else if (changed.has(sownCol.key)) out.push({ key: sownCol.key, message });
  }
  return out;
}

export const sameValue = (a: CellValue | null, b: CellValue | null): boolean =>
  (a?.valueNumber ?? null) === (b?.valueNumber ?? null) && (a?.valueDate ?? null) === (b?.valueDate ?? null) && (a?.valueText ?? null) === (b?.valueText ?? null);

export const isBlank = (v: CellValue | null): boolean => v === null || (v.valueNumber === null && v.valueDate === null && v.valueText === null);

/** The value as a grower would type it, for inputs and previews. */
export function displayValue(c: Pick<EntryColumn, "valueType">, v: CellValue | null): string {
  if (!v) return "";
  if (c.valueType === "date") return v.valueDate ?? "";
  if (c.valueType === "text") return v.valueText ?? "";
  if (c.valueType === "yes_no") return v.valueNumber === null ? "" : v.valueNumber ? "yes" : "no";
  return v.valueNumber === null ? "" : String(v.valueNumber);
}

export const VALUE_AND_REASON_MESSAGE = "Enter a value or choose why there is none, not both.";

export type EntryResult = { ok: true; value: CellValue | null; reason: MissingReason | null } | { ok: false; message: string };

/**
 * Parses what one field or cell holds: a value, or no value with the reason why. The reason comes from the
 * form's own choice or from a cell written like "missing: died"; both at once is refused.
 */
export function parseEntry(c: EntryColumn, raw: unknown, reason: MissingReason | null | undefined, ctx: ParseContext): EntryResult {
  const blank = raw === null || raw === undefined || (typeof raw === "string" && raw.trim() === "");
  if (reason) return blank ? { ok: true, value: null, reason } : { ok: false, message: ctx.t ? ctx.t("values.valueAndReason") : VALUE_AND_REASON_MESSAGE };
  const missing = parseMissingText(raw, ctx.t);
  if (missing) return missing.ok ? { ok: true, value: null, reason: missing.reason } : missing;
  const parsed = parseCell(c, raw, ctx);
  return parsed.ok ? { ok: true, value: parsed.value, reason: null } : parsed;
}

/** A value or its missing reason as a spreadsheet cell or audit entry writes it. */
export function displayEntry(c: Pick<EntryColumn, "valueType">, v: CellValue | null, reason: MissingReason | null | undefined): string {
  return reason ? missingCell(reason) : displayValue(c, v);
}
