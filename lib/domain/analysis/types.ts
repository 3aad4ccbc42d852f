/**
 * Plain data shapes for the analysis of one trial trait: what the query layer hands in (rows already
 * scoped to the viewer) and the result DTO the page, the JSON API and the exports all show.
 */
import type { AnovaRow } from "@/lib/domain/stats";
import type { BetterWhen, ExclusionCategory, SubmissionStatus, TrialStatus } from "@/lib/domain/vocabulary/enums";
import type { StabilityAnalysis, StabilityRow } from "./stability";

import type { MixedAnalysis } from "./mixed";

export type SiteModel = "random" | "fixed";
export type Separation = "lsd" | "tukey";
export type SubmissionState = SubmissionStatus;

export interface AnalysisSettings {
  traitId: number;
  /** sites asked for; null = every site the data allow */
  siteIds: number[] | null;
  includeUnaccepted: boolean;
  siteModel: SiteModel;
  separation: Separation;
  /** also fit the REML mixed model (staff only; lib/domain/analysis/mixed-trial.ts) */
  mixed?: boolean;
}

export interface InputTrait {
  id: number;
  code: string;
  name: string;
  unit: string | null;
  valueType: "count" | "date" | "number" | "rating" | "yes_no" | "text";
  computation: "none" | "days_from_sowing" | "days_from_transplant";
  /** the trial's direction for this trait (the library's default unless the coordinator set one) */
  betterWhen: BetterWhen;
}

export interface InputEntry {
  id: number;
  blindCode: string;
  entryNumber: number;
  /** null when the viewer may not see variety names */
  varietyName: string | null;
  varietyId: number | null;
  isCheck: boolean;
  /** label germination %, null when the label does not state it */
  labelGermination: number | null;
  seedLot: string | null;
}

export interface InputSite {
  id: number;
  name: string;
  sownOn: string | null;
  transplantedOn: string | null;
  status: SubmissionState;
  /** results shown to the site's cooperators */
  resultsShared?: boolean;
}

export interface InputPlot {
  id: number;
  plotCode: string;
  siteId: number;
  entryId: number;
  block: number;
}

export interface InputObservation {
  plotId: number;
  traitId: number;
  occasion: number;
  valueNumber: number | null;
  valueDate: string | null;
  missingReason: string | null;
}

export interface InputExclusion {
  id: number;
  siteId: number | null;
  plotId: number | null;
  /** null = every trait */
  traitId: number | null;
  /** the public reason, published with the results */
  category: ExclusionCategory;
  /** the staff's own note: null for anyone else, and never published */
  note: string | null;
  createdAt: string;
  createdBy: string | null;
}

/** The blind-code key is public once a trial is published. */
export type TrialStage = TrialStatus;

export interface AnalysisInput {
  trial: { id: number; code: string; title: string; crop: string; blocks: number; status: TrialStage };
  traits: InputTrait[];
  entries: InputEntry[];
  sites: InputSite[];
  plots: InputPlot[];
  /** observations of the analysed trait plus the seed counts (seeds_sown, emerged_final, emergence_count) */
  observations: InputObservation[];
  exclusions: InputExclusion[];
}

export interface EntryResult {
  entryId: number;
  blindCode: string;
  varietyName: string | null;
  varietyId: number | null;
  isCheck: boolean;
  /** arithmetic mean of observed plots */
  mean: number;
  /** least-squares mean (equals mean when no plot is missing); null when not estimable */
  lsMean: number | null;
  se: number;
  n: number;
  /** compact letters from the chosen comparison; null when no comparison is shown */
  letter: string | null;
  /** 1 = best for the trait's direction; null when the trait has no preferred direction (see ranking.ts) */
  rank: number | null;
  /** mean as % of the check's mean (check = 100); null without a check */
  percentOfCheck: number | null;
  /** mean minus the check's mean; null without a check */
  checkDifference: number | null;
  /** whether that difference exceeds the LSD 0.05; null when there is no LSD */
  beyondLsd: boolean | null;
}

export interface AnalysisBlock {
  rows: AnovaRow[];
  n: number;
  missing: number;
  grandMean: number;
  /** CV %; null for yes/no traits, where a CV says nothing (see hasCv) */
  cv: number | null;
  errorMs: number;
  errorDf: number;
  entryF: number | null;
  entryP: number | null;
  means: EntryResult[];
  /** LSD 0.05 (protected: null when entries did not differ) */
  lsd: number | null;
  /** Tukey critical difference for equal replication, or null */
  tukeyQ: number | null;
  /** one plain sentence on what the comparison shows */
  comparisonNote: string;
}

export interface SiteAnalysis {
  siteId: number;
  siteName: string;
  status: SubmissionState;
  blocks: number;
  /** null when the site could not be analysed; `problem` says why */
  result: AnalysisBlock | null;
  problem: string | null;
}

export interface CombinedAnalysis extends AnalysisBlock {
  siteModel: SiteModel;
  sites: number;
  interactionF: number | null;
  interactionP: number | null;
  bartlett: { statistic: number; df: number; p: number } | null;
  /** entry mean per site, for the interaction plot */
  cellMeans: { siteId: number; siteName: string; entryId: number; mean: number; n: number }[];
  /** each variety's response to the sites and the GGE biplot (stability.ts); null with `stabilityProblem` saying why */
  stability: StabilityAnalysis | null;
  stabilityProblem: string | null;
}

export interface MissingPlot {
  plotCode: string;
  siteName: string;
  blindCode: string;
  block: number;
  reason: string;
  handling: string;
}

export interface SiteChoice {
  id: number;
  name: string;
  status: SubmissionState;
  /** in the analysis after every rule (selection, acceptance, exclusion) */
  included: boolean;
  /** results shown to the site's cooperators */
  shared: boolean;
  why: string | null;
}

export interface GerminationRow {
  entryId: number;
  blindCode: string;
  varietyName: string | null;
  siteId: number | null;
  siteName: string | null;
  sown: number;
  emerged: number;
  percent: number;
  lower: number;
  upper: number;
}

export interface LabelComparison {
  entryId: number;
  blindCode: string;
  varietyName: string | null;
  seedLot: string | null;
  labelPercent: number | null;
  observedPercent: number;
  sown: number;
  chiSquareP: number | null;
  /** 7 CFR 201.63 tolerance check; null when the label states no germination */
  tolerance: number | null;
  withinTolerance: boolean | null;
  note: string;
}

export interface GerminationAnalysis {
  byEntry: GerminationRow[];
  bySite: GerminationRow[];
  chiSquare: { statistic: number; df: number; p: number; lowExpected: number; cells: number } | null;
  cmh: { statistic: number; df: number; p: number; sites: number } | null;
  labels: LabelComparison[];
  note: string;
}

export interface EmergenceAnalysis {
  days: number[];
  /** cumulative % emerged per entry and day, pooled over the plots counted that day */
  curve: { entryId: number; blindCode: string; varietyName: string | null; day: number; percent: number; plots: number }[];
  kinetics: { entryId: number; blindCode: string; varietyName: string | null; meanEmergenceTime: number | null; t50: number | null; finalPercent: number; plots: number }[];
  note: string;
}

export interface AnalysisResult {
  trial: { id: number; code: string; title: string; crop: string; status: TrialStage };
  settings: AnalysisSettings;
  trait: InputTrait & { analysedAs: string };
  traits: { id: number; name: string; analysable: boolean }[];
  sites: SiteChoice[];
  perSite: SiteAnalysis[];
  combined: CombinedAnalysis | null;
  /** why there is no combined analysis, when there is none */
  combinedProblem: string | null;
  missing: MissingPlot[];
  /** the sites and plots left out of this trait's analysis (not other traits'), each with its public reason */
  exclusions: DescribedExclusion[];
  warnings: string[];
  notes: string[];
  /** one-line explanations of the analysis choices, shown beside the controls */
  explanations: Record<"siteModel" | "separation" | "missing" | "unaccepted" | "cv", string>;
  germination: GerminationAnalysis | null;
  emergence: EmergenceAnalysis | null;
  /** raw plot values used (after exclusions), for exports and the published data download */
  plots: PlotValue[];
  /** the REML mixed model when settings.mixed asked for it; mixedProblem says why there is none */
  mixed?: MixedAnalysis | null;
  mixedProblem?: string | null;
}

export type MixedOutcome = { mixed: MixedAnalysis | null; mixedProblem: string | null };

/** An exclusion with the names people know it by; `publicReason` is the category in words. */
export type DescribedExclusion = InputExclusion & { siteName: string | null; plotCode: string | null; traitName: string | null; publicReason: string };

/** One plot's value as the analysis read it. */
export interface PlotValue {
  plotCode: string;
  siteId: number;
  siteName: string;
  block: number;
  entryId: number;
  blindCode: string;
  varietyName: string | null;
  value: number | null;
  status: "used" | "missing" | "excluded";
}

/**
 * What the analysis page and the JSON API send: the result without the plot rows, which are most of its
 * size (8,000 rows for 50 sites x 40 entries x 4 blocks) and which the page never shows. Missing and
 * excluded plots are still listed in `missing` and `exclusions`; the rows come only when asked for.
 */
export type AnalysisPayload = Omit<AnalysisResult, "plots"> & { plots?: PlotValue[] };

/** An entry-level row as someone without the blind-code key sees it: the blind code and nothing that decodes it. */
export type Unkeyed<T> = Omit<T, "varietyName" | "varietyId" | "isCheck" | "seedLot" | "percentOfCheck" | "checkDifference" | "beyondLsd">;

export interface BlindAnalysisBlock extends Omit<AnalysisBlock, "means"> {
  means: Unkeyed<EntryResult>[];
}

/**
 * What a cooperator receives before the key is revealed (lib/domain/analysis/blind.ts builds it): blind codes
 * only, no check flag, no label germination or seed lots, entries numbered and ordered by blind code
 * rather than by the coordinator's entry list, and no coordinator's notes on exclusions.
 */
export interface BlindAnalysisPayload extends Omit<AnalysisPayload, "perSite" | "combined" | "germination" | "emergence" | "plots"> {
  blind: true;
  perSite: (Omit<SiteAnalysis, "result"> & { result: BlindAnalysisBlock | null })[];
  combined: (Omit<CombinedAnalysis, "means" | "stability"> & { means: Unkeyed<EntryResult>[]; stability: BlindStability | null }) | null;
  germination: (Omit<GerminationAnalysis, "byEntry" | "bySite" | "labels"> & { byEntry: Unkeyed<GerminationRow>[]; bySite: Unkeyed<GerminationRow>[] }) | null;
  emergence: { days: number[]; curve: Unkeyed<EmergenceAnalysis["curve"][number]>[]; kinetics: Unkeyed<EmergenceAnalysis["kinetics"][number]>[]; note: string } | null;
  plots?: Unkeyed<PlotValue>[];
}

/** Stability as a grower sees it before the reveal: blind codes only. */
export interface BlindStability extends Omit<StabilityAnalysis, "rows" | "gge"> {
  rows: Unkeyed<StabilityRow>[];
  gge: { explained: [number, number]; entries: Unkeyed<StabilityAnalysis["gge"]["entries"][number]>[]; sites: StabilityAnalysis["gge"]["sites"] };
}

/** What the analysis page and JSON API send a signed-in viewer: the whole payload for staff, blind for growers until the reveal. */
export type ViewerAnalysis = AnalysisPayload | BlindAnalysisPayload;
