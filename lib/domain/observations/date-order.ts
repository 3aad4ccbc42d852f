import type { EntryColumn } from "./columns";
import type { CellValue } from "./values";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { EMERGENCE_DATE_CODE, isMaturityDateCode } from "@/lib/domain/vocabulary/traits";

// Whether a plot's dates can be in the order they were recorded. Pure, so the phone form, the upload
// preview, the save and the review page all say the same thing.
//
// Refused (the value is not saved): a date before the site's sowing date, and a date counted from
// transplanting before the site's transplanting date. The analysis counts these dates in days from that site
// date, so such a value would be a negative number of days: it cannot be right whatever else is recorded.
//
// Warned (saved, and listed under "Values to check"): a harvest or maturity date on or before the plot's
// emergence date or before the site's transplanting date, and one far from the packet's days to maturity.
// Either date of a pair may be the wrong one (refusing the harvest date just typed would block a right
// value behind an earlier slip in the emergence date), and a season, a site or an early cut can move
// maturity a long way from the packet.

export interface SiteDates {
  sownOn: string | null;
  transplantedOn: string | null;
}

export type DateCheckKind = "date_order" | "far_from_packet";

export interface DateWarning {
  /** The value the warning is about (a harvest or maturity date). */
  key: string;
  /** Every value the warning involves, so a form can show it under both dates of a pair. */
  keys: string[];
  kind: DateCheckKind;
  message: string;
}

type DateColumn = Pick<EntryColumn, "key" | "name" | "traitCode" | "valueType" | "computation">;

/**
 * "First harvest date" -> "First harvest", so sentences read "First harvest on 3 May 2026"; a Spanish column
 * name "Fecha de primera cosecha" -> "primera cosecha", for "La fecha de primera cosecha (3 may 2026)".
 */
function eventName(c: Pick<EntryColumn, "name">): string {
  const name = c.name.replace(/\s+date$/i, "").replace(/^fecha de\s+/i, "").trim();
  return name === "" ? c.name : name;
}
const lowerFirst = (s: string) => (/^[A-Z][a-z]/.test(s) ? s[0]!.toLowerCase() + s.slice(1) : s);

function daysBetween(fromIso: string, toIso: string): number {
  return Math.round((Date.parse(`${toIso}T00:00:00Z`) - Date.parse(`${fromIso}T00:00:00Z`)) / 86_400_000);
}

/**
 * How far from the packet's days to maturity a harvest may fall before it is worth a second look: two
 * weeks, or 40% of the packet's figure for long crops. A rule of thumb (from memory): packet figures are
 * for good conditions, and a cool spring, a short day or a baby-leaf cut moves them by weeks.
 */
export function packetTolerance(packetDays: number): number {
  return Math.max(14, Math.round(0.4 * packetDays));
}

/**
 * Why one recorded date cannot be right against the site's own dates, or null. Applies to every date
 * trait: nothing is recorded before sowing, and a date counted from transplanting is not before it.
 */
export function siteDateRefusal(c: Pick<EntryColumn, "name" | "computation">, iso: string, site: SiteDates, t: Translator = translatorFor()): string | null {
  const what = { event: eventName(c), date: formatDate(iso, t.locale) };
  if (site.sownOn && iso < site.sownOn) return t("dateChecks.beforeSowing", { ...what, sown: formatDate(site.sownOn, t.locale) });
  if (c.computation === "days_from_transplant" && site.transplantedOn && iso < site.transplantedOn) {
    return t("dateChecks.beforeTransplantCounted", { ...what, transplanted: formatDate(site.transplantedOn, t.locale) });
  }
  return null;
}

/**
 * Dates of one plot worth a second look (see the note at the top). `packetDays` is the days to maturity on
 * the entry's seed packet, or null when unknown or not to be used. Growers record blind, so their wording
 * (`audience: "grower"`) never states the packet's figure.
 */
export function datesToCheck(p: {
  columns: readonly DateColumn[];
  value: (key: string) => CellValue | null | undefined;
  site: SiteDates;
  packetDays: number | null;
  audience: "grower" | "staff";
  /** The reader's language (English when left out). */
  t?: Translator;
}): DateWarning[] {
  const t = p.t ?? translatorFor();
  const dateOf = (c: DateColumn) => (c.valueType === "date" ? (p.value(c.key)?.valueDate ?? null) : null);
  const emergence = p.columns.find((c) => c.valueType === "date" && c.traitCode === EMERGENCE_DATE_CODE);
  const emergedOn = emergence ? dateOf(emergence) : null;
  const out: DateWarning[] = [];
  for (const c of p.columns) {
    if (c.valueType !== "date" || !isMaturityDateCode(c.traitCode)) continue;
    const on = dateOf(c);
    if (!on) continue;
    const what = { event: eventName(c), date: formatDate(on, t.locale) };
    if (emergence && emergedOn && on <= emergedOn) {
      const message = t("dateChecks.beforeEmergence", { ...what, same: on === emergedOn ? "yes" : "no", other: lowerFirst(eventName(emergence)), otherDate: formatDate(emergedOn, t.locale) });
      out.push({ key: c.key, keys: [c.key, emergence.key], kind: "date_order", message });
    }
    if (c.computation !== "days_from_transplant" && p.site.transplantedOn && on < p.site.transplantedOn) {
      out.push({ key: c.key, keys: [c.key], kind: "date_order", message: t("dateChecks.beforeTransplant", { ...what, transplanted: formatDate(p.site.transplantedOn, t.locale) }) });
    }
    const fromTransplant = c.computation === "days_from_transplant";
    const start = fromTransplant ? p.site.transplantedOn : p.site.sownOn;
    if (p.packetDays !== null && p.packetDays > 0 && start && on >= start) {
      const taken = daysBetween(start, on);
      if (Math.abs(taken - p.packetDays) > packetTolerance(p.packetDays)) {
        const after = { ...what, taken, from: fromTransplant ? "transplant" : "sowing" };
        const message =
          p.audience === "staff"
            ? t("dateChecks.farFromPacket", { ...after, packet: p.packetDays })
            : t("dateChecks.farFromExpected", { ...after, sooner: taken < p.packetDays ? "yes" : "no" });
        out.push({ key: c.key, keys: [c.key], kind: "far_from_packet", message });
      }
    }
  }
  return out;
}
