import "server-only";
import { listPlanningSources } from "@/db/queries/planning";
import { loadAnalysis } from "@/server/analysis/load-analysis";
import { AppError } from "@/lib/errors";
import { differenceUnit, unitHeading } from "@/lib/domain/analysis/format";
import type { Viewer } from "@/lib/domain/viewer";

export interface PlanningBaseline {
  trial: { id: number; code: string; title: string };
  trait: { id: number; name: string; unit: string | null; differenceUnit: string | null };
  /** CV % of the plot-to-plot error, pooled over the sites analysed together (or of the one site) */
  cv: number;
  mean: number;
  sites: number;
  /** where the CV comes from, in words */
  from: string;
}

/**
 * The CV and mean a past trial of the same crop reached for one trait, from its analysis (accepted data,
 * every site), for planning `trialId`. Refuses a past trial that is not one of the planning sources the
 * viewer may use for this trial, exactly as a missing one.
 */
export async function planningBaseline(viewer: Viewer, trialId: number, p: { from: number; trait: number }): Promise<PlanningBaseline> {
  const sources = await listPlanningSources(viewer, trialId);
  const source = sources.find((s) => s.id === p.from);
  if (!source) throw new AppError("not_found", "That past trial is not one of your trials of this crop.");
  if (!source.traits.some((t) => t.id === p.trait)) throw new AppError("bad_request", "That trait is not a measured trait of the past trial. Choose one from the list.");
  const loaded = await loadAnalysis(viewer, source.id, { trait: p.trait });
  if (!loaded) throw new AppError("not_found", "That past trial is not one of your trials of this crop.");
  const { result } = loaded;
  const analysed = result.perSite.filter((s) => s.result !== null);
  const block = result.combined ?? analysed[0]?.result ?? null;
  if (!block || block.cv === null || !Number.isFinite(block.cv) || !(block.grandMean > 0)) {
    throw new AppError("conflict", `${source.code} has no analysed ${result.trait.name.toLowerCase()} values with accepted data to take a CV from. Pick another trait or trial, or type a CV.`);
  }
  return {
    trial: { id: source.id, code: source.code, title: source.title },
    trait: { id: result.trait.id, name: result.trait.name, unit: unitHeading(result.trait), differenceUnit: differenceUnit(result.trait) },
    cv: block.cv,
    mean: block.grandMean,
    sites: result.combined ? result.combined.sites : 1,
    from: result.combined ? `the pooled plot error over its ${result.combined.sites} analysed sites` : `its one analysed site, ${analysed[0]!.siteName}`,
  };
}
