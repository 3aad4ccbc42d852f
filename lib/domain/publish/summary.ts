import { extremeWord, inStatedOrder, noPairDiffers, rankedValue } from "@/lib/domain/analysis/ranking";
import type { AnalysisResult, EntryResult } from "@/lib/domain/analysis/types";
import { formatP, valueWithUnit } from "@/lib/domain/analysis/format";
import { capitalise } from "@/lib/domain/vocabulary/words";

function nameOf(e: EntryResult): string {
  return e.varietyName ?? e.blindCode;
}

function listNames(names: string[]): string {
  if (names.length <= 1) return names.join("");
  return `${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}

/**
 * Plain-language lines for growers: which varieties did well on each trait, and how sure we are. The
 * wording follows the statistics: a difference is only claimed when the entry F test was significant
 * at 5%, and a large entry x site interaction turns the advice into "check your own site".
 */
export function summariseForGrowers(results: AnalysisResult[]): string[] {
  const lines: string[] = [];
  for (const r of results) {
    const trait = r.trait.analysedAs.toLowerCase();
    const block = r.combined ?? r.perSite.find((s) => s.result)?.result ?? null;
    if (!block || block.means.length === 0) continue;
    const sites = r.combined ? `across ${r.combined.sites} sites` : "at the one site analysed";
    const ordered = inStatedOrder(block.means);
    const first = ordered[0]!;
    const last = ordered[ordered.length - 1]!;
    const significant = block.entryP !== null && block.entryP < 0.05;
    if (!significant) {
      lines.push(`${capitalise(trait)}: the varieties did not differ clearly ${sites} (${formatP(block.entryP)}); treat any order as a tie.`);
      continue;
    }
    if (noPairDiffers(block.means)) {
      lines.push(`${capitalise(trait)}: the F test found the varieties different ${sites} (${formatP(block.entryP)}), but Tukey's test found no pair that clearly differs; treat the order as a tie.`);
      continue;
    }
    const value = (m: EntryResult) => valueWithUnit(r.trait, rankedValue(m));
    if (r.trait.betterWhen === "neither") {
      lines.push(
        `${capitalise(trait)}: ${nameOf(first)} was ${extremeWord(r.trait, "first")} ${sites} (${value(first)}) and ${nameOf(last)} ${extremeWord(r.trait, "last")} (${value(last)}); neither end is better in itself.`,
      );
      continue;
    }
    const sameGroup = first.letter ? ordered.filter((e) => e !== first && e.letter && sharesLetter(e.letter, first.letter!)).map(nameOf) : [];
    let line = `${capitalise(trait)}: ${nameOf(first)} came first ${sites} with the ${extremeWord(r.trait, "first")} mean (${value(first)})`;
    line += !first.letter
      ? "."
      : sameGroup.length
        ? `, not clearly different from ${listNames(sameGroup)}.`
        : ", clearly ahead of the others.";
    if (r.combined && r.combined.interactionP !== null && r.combined.interactionP < 0.05) {
      line += " Rankings changed from site to site, so look at the site most like your own.";
    }
    lines.push(line);
  }
  if (lines.length === 0) lines.push("There were not enough data to compare the varieties.");
  return lines;
}

function sharesLetter(a: string, b: string): boolean {
  return [...a].some((ch) => b.includes(ch));
}

