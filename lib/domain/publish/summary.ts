import type { AnalysisResult, EntryResult } from "@/lib/domain/analysis/types";
import { formatNumber } from "@/lib/domain/analysis/format";

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
    const unit = r.trait.unit && r.trait.valueType !== "date" && r.trait.valueType !== "yes_no" ? ` ${r.trait.unit}` : "";
    const block = r.combined ?? r.perSite.find((s) => s.result)?.result ?? null;
    if (!block || block.means.length === 0) continue;
    const sites = r.combined ? `across ${r.combined.sites} sites` : "at the one site analysed";
    const ranked = [...block.means].sort((a, b) => a.rank - b.rank);
    const top = ranked[0]!;
    const lowerIsBetter = /days|time/.test(trait);
    const best = lowerIsBetter ? ranked[ranked.length - 1]! : top;
    const significant = block.entryP !== null && block.entryP < 0.05;
    if (!significant) {
      lines.push(
        `${capitalise(trait)}: the varieties did not differ clearly ${sites} (p = ${formatNumber(block.entryP, 2)}); treat the ranking as a tie.`,
      );
      continue;
    }
    const sameGroup = best.letter ? ranked.filter((e) => e !== best && e.letter && sharesLetter(e.letter, best.letter!)).map(nameOf) : [];
    const extreme = lowerIsBetter ? "lowest" : "highest";
    let line = `${capitalise(trait)}: ${nameOf(best)} had the ${extreme} mean ${sites} (${formatNumber(best.lsMean ?? best.mean, 1)}${unit})`;
    line += sameGroup.length ? `, not clearly different from ${listNames(sameGroup)}.` : ", clearly ahead of the others.";
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

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
