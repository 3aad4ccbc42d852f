import { orderWords } from "@/lib/domain/analysis/ranking";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import type { PublicBlock, PublicCombined, PublicTraitResult } from "./public-shape";

/** Only what the public trait view shows, so the page does not ship every plot row to the browser. */
export interface PublicTraitView {
  analysedAs: string;
  unit: string;
  betterWhen: BetterWhen;
  /** "highest first (higher is better)", "earliest first (...)": how the means are listed */
  order: string;
  problem: string | null;
  scope: string;
  block: Pick<PublicBlock, "means" | "cv" | "lsd" | "entryP" | "comparisonNote"> | null;
  combined: Pick<PublicCombined, "cellMeans" | "sites"> | null;
}

/** Reduces a published analysis to the public trait view (runs on the server). */
export function toPublicTraitView(result: PublicTraitResult): PublicTraitView {
  const block = result.combined ?? result.perSite.find((s) => s.result)?.result ?? null;
  return {
    analysedAs: result.trait.analysedAs,
    unit: result.trait.computation !== "none" || result.trait.valueType === "date" ? "days" : (result.trait.unit ?? ""),
    betterWhen: result.trait.betterWhen,
    order: orderWords(result.trait),
    problem: result.combinedProblem,
    scope: result.combined ? `across ${result.combined.sites} sites` : `at ${result.perSite.find((s) => s.result)?.siteName ?? "one site"}`,
    block: block && { means: block.means, cv: block.cv, lsd: block.lsd, entryP: block.entryP, comparisonNote: block.comparisonNote },
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

export function toPublicGerminationView(results: { result: PublicTraitResult }[]): PublicGerminationView | null {
  const g = results.find((r) => r.result.germination)?.result.germination ?? null;
  return g && { byEntry: g.byEntry, bySite: g.bySite, chiSquare: g.chiSquare, cmh: g.cmh, labels: g.labels, note: g.note };
}
