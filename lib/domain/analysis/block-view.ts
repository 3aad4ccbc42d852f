import type { AnovaRow } from "@/lib/domain/stats";
import type { AnalysisBlock } from "./types";

/** An ANOVA row copied field by field, so a field added to the row later reaches no outside reader by default. */
export const anovaRowView = (r: AnovaRow): AnovaRow => ({ source: r.source, df: r.df, ss: r.ss, ms: r.ms, f: r.f, p: r.p, ...(r.testedAgainst ? { testedAgainst: r.testedAgainst } : {}) });

/**
 * One analysis block copied field by field for a reader outside the trial's staff (a grower's blind view, the
 * public), with the entry means already turned into what that reader may see.
 */
export function blockView<M>(b: AnalysisBlock, means: M[]): Omit<AnalysisBlock, "means"> & { means: M[] } {
  return {
    rows: b.rows.map(anovaRowView),
    n: b.n,
    missing: b.missing,
    grandMean: b.grandMean,
    cv: b.cv,
    errorMs: b.errorMs,
    errorDf: b.errorDf,
    entryF: b.entryF,
    entryP: b.entryP,
    means,
    lsd: b.lsd,
    tukeyQ: b.tukeyQ,
    comparisonNote: b.comparisonNote,
  };
}
