/**
 * Seedplot statistics engine: pure, deterministic functions with no I/O. Every function throws
 * a StatsError with a plain-language message on bad input instead of returning NaN.
 */
export { StatsError, isStatsError, type StatsErrorCode } from "./errors";
export {
  anovaOneWay,
  anovaRcbd,
  anovaMultiSite,
  type Source,
  type AnovaRow,
  type AnovaTable,
  type EntryMean,
  type LsMean,
  type OneWayPlot,
  type RcbdPlot,
  type MultiSitePlot,
} from "./anova";
export {
  mixedModel,
  type MixedPlot,
  type MixedTerm,
  type MixedModelResult,
  type MixedModelOptions,
} from "./mixed-model";
export { lsd, lsdLetters, pairwiseLsd, tukeyHsd, compactLetters, type LsdPair } from "./mean-separation";
export { chiSquareGoodnessOfFit, chiSquareIndependence, cochranMantelHaenszel } from "./chi-square";
export { bartlett, bartlettFromVariances } from "./variance-tests";
export {
  wilsonInterval,
  germinationByEntry,
  germinationHomogeneity,
  germinationHomogeneityBySite,
  germinationVersusLabel,
  emergenceKinetics,
  type GerminationPlot,
} from "./germination";
export { maxToleratedRange, checkReplicateRange, labelTolerance, checkAgainstLabel } from "./seed-rules";
export {
  normalUpper,
  normalCdf,
  normalQuantile,
  studentTUpper,
  studentTTwoSided,
  studentTCdf,
  studentTQuantile,
  fUpper,
  fCdf,
  fQuantile,
  chiSquareUpper,
  chiSquareCdf,
  chiSquareQuantile,
  studentizedRangeUpper,
  studentizedRangeCdf,
  studentizedRangeQuantile,
} from "./distributions";
export { stability, STABILITY_MIN_ENTRIES, STABILITY_MIN_ENVIRONMENTS, type CellMean, type EntryStability, type GgeResult, type StabilityResult } from "./stability";
export { planTrial, PLANNING_MAX_BLOCKS, TARGET_POWER, type TrialPlan, type TrialPlanInput } from "./planning";
export { noncentralTCdf } from "./noncentral-t";
