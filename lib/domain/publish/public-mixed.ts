/**
 * A trait's published mixed model in its public shape: names and blind codes (public once published),
 * no internal entry or variety ids.
 */
import type { MixedAnalysis } from "@/lib/domain/analysis/mixed";

export interface PublicMixed {
  environmentWord: "site" | "site-year";
  environments: string[];
  n: number;
  dfMethod: "satterthwaite" | "kenward-roger";
  singular: boolean;
  components: { term: string; variance: number; share: number; words: string }[];
  entryTest: { numDf: number; denDf: number; f: number; p: number };
  means: { blindCode: string; varietyName: string | null; isCheck: boolean; mean: number; se: number; df: number; n: number; letter: string | null; rank: number | null; percentOfCheck: number | null; checkDifference: number | null }[];
  pairs: { a: string; b: string; diff: number; se: number; df: number; t: number; p: number }[];
  notes: string[];
}

export function toPublicMixed(m: MixedAnalysis | null | undefined): PublicMixed | null {
  if (!m) return null;
  return {
    environmentWord: m.environmentWord,
    environments: m.environments,
    n: m.n,
    dfMethod: m.dfMethod,
    singular: m.singular,
    components: m.components.map((c) => ({ term: c.term, variance: c.variance, share: c.share, words: c.words })),
    entryTest: { numDf: m.entryTest.numDf, denDf: m.entryTest.denDf, f: m.entryTest.f, p: m.entryTest.p },
    means: m.means.map((x) => ({
      blindCode: x.blindCode,
      varietyName: x.varietyName,
      isCheck: x.isCheck,
      mean: x.mean,
      se: x.se,
      df: x.df,
      n: x.n,
      letter: x.letter,
      rank: x.rank,
      percentOfCheck: x.percentOfCheck,
      checkDifference: x.checkDifference,
    })),
    pairs: m.pairs.map((p) => ({ a: p.aLabel, b: p.bLabel, diff: p.diff, se: p.se, df: p.df, t: p.t, p: p.p })),
    notes: m.notes,
  };
}
