import { orderWords } from "@/lib/domain/analysis/ranking";
import { isDays } from "@/lib/domain/analysis/format";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { figuresOf, localAnalysedAs } from "@/lib/domain/i18n/traits";
import type { PublicBlock, PublicCombined, PublicTraitResult } from "./public-shape";

/** Only what the public trait view shows, so the page does not ship every plot row to the browser. */
export interface PublicTraitView {
  analysedAs: string;
  unit: string;
  betterWhen: BetterWhen;
  computation: string;
  /** "highest first", "earliest first": how the means are listed, in the page's language */
  order: string;
  /** the order and what rank 1 means, in one plain sentence */
  orderSentence: string;
  problem: string | null;
  scope: string;
  block: Pick<PublicBlock, "means" | "cv" | "lsd" | "entryP" | "comparisonNote"> | null;
  combined: Pick<PublicCombined, "cellMeans" | "sites"> | null;
}

type Which = "earliest" | "lowest" | "highest";

/** The order of the means and what rank 1 means, in the translator's language. */
function orderOf(t: Translator, trait: { betterWhen: BetterWhen; computation: string }): { first: Which; short: string; sentence: string } {
  const days = trait.computation !== "none";
  const first: Which = trait.betterWhen === "higher" ? "highest" : days ? "earliest" : "lowest";
  const sentence =
    trait.betterWhen === "neither"
      ? t("publicTables.orderNeither", { first })
      : t("publicTables.orderRanked", { first, why: trait.betterWhen === "higher" ? "higher" : days ? "earlier" : "lower" });
  return { first, short: t.locale === "en" ? orderWords(trait) : t("publicTables.orderShort", { first }), sentence };
}

/**
 * The note under a means table ("LSD 0.05 = 134 g per plot.", "Tukey found 2 pairs that differ at α = 0.05.")
 * in the translator's language. The published note is English text; its figures are read from the block,
 * and a note of another form is shown as published.
 */
export function localComparisonNote(t: Translator, trait: PublicTraitResult["trait"], block: Pick<PublicBlock, "lsd" | "comparisonNote">): string {
  const note = block.comparisonNote;
  if (t.locale === "en") return note;
  const figures = figuresOf(t);
  if (note.startsWith("LSD 0.05 = ") && block.lsd !== null) return t("summary.lsdNote", { lsd: figures.difference(trait, block.lsd), average: note.includes("average over pairs") ? "yes" : "no" });
  if (note.startsWith("no LSD is given")) return t("summary.noLsd");
  const tukey = /^Tukey found (no|\d+) pairs? that differs? at α = ([0-9.]+)\.$/.exec(note);
  if (tukey) return t("summary.tukeyPairs", { count: tukey[1] === "no" ? 0 : Number(tukey[1]), alpha: figures.number(Number(tukey[2]), 2) });
  const notComparable = /^means cannot be compared: (.*)$/.exec(note);
  if (notComparable) return t("summary.notComparable", { why: notComparable[1]! });
  return note;
}

/** Reduces a published analysis to the public trait view (runs on the server), in the translator's language. */
export function toPublicTraitView(result: PublicTraitResult, t: Translator = translatorFor("en")): PublicTraitView {
  const block = result.combined ?? result.perSite.find((s) => s.result)?.result ?? null;
  const order = orderOf(t, result.trait);
  const heading = isDays(result.trait) ? figuresOf(t).heading(result.trait)! : result.trait.unit ? figuresOf(t).heading({ ...result.trait, valueType: "number" })! : "";
  const site = result.perSite.find((s) => s.result)?.siteName;
  return {
    analysedAs: localAnalysedAs(t, result.trait),
    unit: heading,
    betterWhen: result.trait.betterWhen,
    computation: result.trait.computation,
    order: order.short,
    orderSentence: order.sentence,
    // The reason is stored as the analysis worded it, in English; other languages say there is too little data.
    problem: t.locale === "en" ? result.combinedProblem : null,
    scope: result.combined
      ? t("publicTables.scopeSites", { count: String(result.combined.sites) })
      : site
        ? t("publicTables.scopeSite", { site })
        : t("summary.oneSite"),
    block: block && { means: block.means, cv: block.cv, lsd: block.lsd, entryP: block.entryP, comparisonNote: localComparisonNote(t, result.trait, block) },
    combined: result.combined && { cellMeans: result.combined.cellMeans, sites: result.combined.sites },
  };
}

/** One published trial on the public index (and in the open data API's trial list). */
export interface PublicTrialCard {
  code: string;
  title: string;
  crop: string;
  cropGroup: string;
  season: string;
  year: number;
  sites: number;
  entries: string[];
  publishedAt: string;
  version: number;
  summary: string;
}

/** The germination section of a published trial (the same figures as the PDF's), or null when seeds were not counted. */
export type PublicGerminationView = NonNullable<PublicTraitResult["germination"]>;

export function toPublicGerminationView(results: { result: PublicTraitResult }[], t: Translator = translatorFor("en")): PublicGerminationView | null {
  const g = results.find((r) => r.result.germination)?.result.germination ?? null;
  if (!g) return null;
  const view = { byEntry: g.byEntry, bySite: g.bySite, chiSquare: g.chiSquare, cmh: g.cmh, labels: g.labels, note: g.note };
  return t.locale === "en" ? view : { ...view, note: localGerminationNote(t, g), labels: g.labels.map((l) => ({ ...l, note: localLabelNote(t, l) })) };
}

/**
 * The germination notes worded again from the published figures (published versions keep them in English);
 * a test that could not be run is said so plainly (its reason is stored in English).
 */
function localGerminationNote(t: Translator, g: PublicGerminationView): string {
  if (g.note.includes("could not be run")) return t("summary.germinationNotRun");
  const figures = figuresOf(t);
  const parts: string[] = [];
  if (g.chiSquare) parts.push(t("summary.germinationPooled", { differed: g.chiSquare.p < 0.05 ? "yes" : "no", statistic: figures.number(g.chiSquare.statistic, 2), df: String(g.chiSquare.df), p: figures.p(g.chiSquare.p) }));
  if (g.cmh) parts.push(t("summary.germinationBySite", { sites: String(g.cmh.sites), differed: g.cmh.p < 0.05 ? "yes" : "no", p: figures.p(g.cmh.p) }));
  parts.push(t("summary.germinationLabelGuide"));
  return parts.join(" ");
}

function localLabelNote(t: Translator, l: PublicGerminationView["labels"][number]): string {
  if (l.labelPercent === null) return t("summary.labelNone");
  if (l.withinTolerance === null || l.tolerance === null) return t("summary.labelFewSeeds");
  if (l.withinTolerance) return t("summary.labelWithin", { tolerance: String(l.tolerance) });
  return t("summary.labelBelow", { shortfall: figuresOf(t).number(l.labelPercent - l.observedPercent, 1), tolerance: String(l.tolerance) });
}
