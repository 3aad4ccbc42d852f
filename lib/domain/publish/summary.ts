import { extremeWord, inStatedOrder, noPairDiffers, rankedValue } from "@/lib/domain/analysis/ranking";
import type { EntryResult } from "@/lib/domain/analysis/types";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import { capitalise } from "@/lib/domain/vocabulary/words";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { figuresOf, localAnalysedAs } from "@/lib/domain/i18n/traits";

type SummaryEntry = Pick<EntryResult, "blindCode" | "varietyName" | "mean" | "lsMean" | "rank" | "letter">;
type SummaryBlock = { means: SummaryEntry[]; entryP: number | null };

/** What the summary reads of a trait's analysis: a full analysis, or the public shape of a published one. */
export interface SummarisedResult {
  trait: { code: string; name: string; unit: string | null; valueType: string; computation: string; betterWhen: BetterWhen; analysedAs: string };
  combined: (SummaryBlock & { sites: number; interactionP: number | null }) | null;
  perSite: { result: SummaryBlock | null }[];
}

function nameOf(e: SummaryEntry): string {
  return e.varietyName ?? e.blindCode;
}

function listNames(t: Translator, names: string[]): string {
  if (names.length <= 1) return names.join("");
  return t("summary.list", { first: names.slice(0, -1).join(", "), last: names[names.length - 1]! });
}

/**
 * Plain-language lines for growers: which varieties did well on each trait, and how sure we are. The
 * wording follows the statistics: a difference is only claimed when the entry F test was significant
 * at 5%, and a large entry x site interaction turns the advice into "check your own site". In the
 * translator's language (English, the published text, by default); variety names stay as typed.
 */
export function summariseForGrowers(results: SummarisedResult[], t: Translator = translatorFor("en")): string[] {
  const figures = figuresOf(t);
  const lines: string[] = [];
  for (const r of results) {
    const trait = capitalise(localAnalysedAs(t, r.trait).toLowerCase());
    const block = r.combined ?? r.perSite.find((s) => s.result)?.result ?? null;
    if (!block || block.means.length === 0) continue;
    const sites = r.combined ? t("summary.acrossSites", { count: String(r.combined.sites) }) : t("summary.oneSite");
    const ordered = inStatedOrder(block.means);
    const first = ordered[0]!;
    const last = ordered[ordered.length - 1]!;
    const p = figures.p(block.entryP);
    const significant = block.entryP !== null && block.entryP < 0.05;
    if (!significant) {
      lines.push(t("summary.notDiffer", { trait, sites, p }));
      continue;
    }
    if (noPairDiffers(block.means)) {
      lines.push(t("summary.noPair", { trait, sites, p }));
      continue;
    }
    const value = (m: SummaryEntry) => figures.value(r.trait, rankedValue(m));
    if (r.trait.betterWhen === "neither") {
      lines.push(
        t("summary.neither", { trait, sites, first: nameOf(first), firstWord: extremeWord(r.trait, "first"), firstValue: value(first), last: nameOf(last), lastWord: extremeWord(r.trait, "last"), lastValue: value(last) }),
      );
      continue;
    }
    const sameGroup = first.letter ? ordered.filter((e) => e !== first && e.letter && sharesLetter(e.letter, first.letter!)).map(nameOf) : [];
    let line = t("summary.cameFirst", { trait, first: nameOf(first), sites, word: extremeWord(r.trait, "first"), value: value(first) });
    line += !first.letter ? t("summary.noLetters") : sameGroup.length ? t("summary.notClearlyDifferent", { names: listNames(t, sameGroup) }) : t("summary.clearlyAhead");
    if (r.combined && r.combined.interactionP !== null && r.combined.interactionP < 0.05) line += t("summary.interaction");
    lines.push(line);
  }
  if (lines.length === 0) lines.push(t("summary.noData"));
  return lines;
}

function sharesLetter(a: string, b: string): boolean {
  return [...a].some((ch) => b.includes(ch));
}
