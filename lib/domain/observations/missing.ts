import { MISSING_REASONS } from "@/lib/domain/vocabulary/enums";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

export type MissingReason = (typeof MISSING_REASONS)[number];

// Why a plot has no value. The phone form offers the labels; a spreadsheet cell holds "missing:" and one of
// the short words, which is also how exports write reasons, so an exported sheet uploads back unchanged.

/** What the phone form shows for each reason, in the grower's language (the catalogue's "missing" words). */
export function missingReasonLabels(t: Translator = translatorFor()): Record<MissingReason, string> {
  return Object.fromEntries(MISSING_REASONS.map((r) => [r, t(`missing.${r}`)])) as Record<MissingReason, string>;
}

/** What the phone form shows for each reason (English). */
export const MISSING_REASON_LABELS: Record<MissingReason, string> = {
  not_sown: "Not sown",
  died: "Plants died",
  animal_damage: "Eaten or damaged by animals",
  lost_label: "Label lost",
  weather: "Weather damage",
  other: "Other",
};

/** The word a spreadsheet cell uses after "missing:". */
export const MISSING_REASON_WORDS: Record<MissingReason, string> = {
  not_sown: "not sown",
  died: "died",
  animal_damage: "animals",
  lost_label: "label lost",
  weather: "weather",
  other: "other",
};

export const MISSING_PREFIX = "missing:";

const squash = (s: string) => s.trim().toLowerCase().replace(/[\s_-]+/g, " ");

const ACCEPTED = new Map<string, MissingReason>();
for (const r of MISSING_REASONS) {
  ACCEPTED.set(squash(r), r);
  ACCEPTED.set(squash(MISSING_REASON_WORDS[r]), r);
  ACCEPTED.set(squash(MISSING_REASON_LABELS[r]), r);
}

export const isMissingReason = (v: unknown): v is MissingReason => typeof v === "string" && (MISSING_REASONS as readonly string[]).includes(v);

/** The reason as a spreadsheet cell writes it, e.g. "missing: died". */
export const missingCell = (r: MissingReason) => `${MISSING_PREFIX} ${MISSING_REASON_WORDS[r]}`;

/** The accepted words in a sentence, for instructions and error messages. */
export const missingWordsList = () => MISSING_REASONS.map((r) => MISSING_REASON_WORDS[r]).join(", ");

/**
 * Reads a cell that starts with "missing" ("missing: died", "Missing - animals"). Null when the cell is not a
 * missing marker at all, so ordinary values and notes go on to be parsed as values.
 */
export function parseMissingText(raw: unknown, t: Translator = translatorFor()): { ok: true; reason: MissingReason } | { ok: false; message: string } | null {
  if (typeof raw !== "string") return null;
  const m = /^\s*missing\b\s*[:\-–]?\s*(.*)$/i.exec(raw);
  if (!m) return null;
  const reason = ACCEPTED.get(squash(m[1] ?? ""));
  if (reason) return { ok: true, reason };
  const said = (m[1] ?? "").trim();
  return { ok: false, message: said ? t("values.missingNotReason", { said, words: missingWordsList() }) : t("values.missingSayWhy", { words: missingWordsList() }) };
}

/** Each missing plot once, with every reason the traits gave for it ("S01-1-03 (Willow Bend, not sown / plants died)"). */
export function missingPlotList(missing: { plotCode: string; siteName: string; reason: string }[]): string {
  const reasons = new Map<string, { plot: string; site: string; reasons: Set<string> }>();
  for (const m of missing) {
    const key = `${m.siteName}\u0000${m.plotCode}`;
    const entry = reasons.get(key) ?? { plot: m.plotCode, site: m.siteName, reasons: new Set<string>() };
    entry.reasons.add(m.reason);
    reasons.set(key, entry);
  }
  return [...reasons.values()].map((p) => `${p.plot} (${p.site}, ${[...p.reasons].join(" / ")})`).join("; ");
}
