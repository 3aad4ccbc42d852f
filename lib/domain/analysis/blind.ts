/**
 * The one gate between an analysis result and a signed-in viewer. Staff of the trial's program see
 * everything; a cooperator sees only what cannot decode a blind code until the trial is published
 * (then the names are public anyway). The page and the JSON API both go through `analysisFor`.
 */
import { canSeeBlindKey, isStaff } from "@/lib/domain/permissions";
import type { Viewer } from "@/lib/domain/viewer";
import { blockView } from "./block-view";
import { LABEL_COMPARISON_NOTE } from "./germination";
import { toAnalysisPayload } from "./payload";
import type {
  AnalysisBlock,
  AnalysisResult,
  BlindAnalysisBlock,
  BlindAnalysisPayload,
  EntryResult,
  GerminationRow,
  Unkeyed,
  ViewerAnalysis,
} from "./types";

/** The analysis as this viewer may see it; `withPlots` adds the plot rows. */
export function analysisFor(viewer: Viewer, result: AnalysisResult, withPlots = false): ViewerAnalysis {
  return isStaff(viewer) ? toAnalysisPayload(result, withPlots) : toCooperatorView(result, withPlots);
}

/**
 * What a cooperator may see of an analysis of their own shared sites: once the trial is published, what
 * the public already knows; before that, the blind view.
 */
export function toCooperatorView(result: AnalysisResult, withPlots = false): ViewerAnalysis {
  return canSeeBlindKey(null, result.trial) ? toAnalysisPayload(result, withPlots) : toBlindPayload(result, withPlots);
}

/**
 * The blind view, built field by field so that nothing added to the result later reaches growers by
 * default. Entries are renumbered and ordered by blind code: entry ids and the staff's entry order
 * follow the coordinator's list, where the check is often first.
 */
export function toBlindPayload(result: AnalysisResult, withPlots = false): BlindAnalysisPayload {
  const codeOf = new Map<number, string>();
  const note = (rows: { entryId: number; blindCode: string }[]) => rows.forEach((r) => codeOf.set(r.entryId, r.blindCode));
  for (const s of result.perSite) note(s.result?.means ?? []);
  note(result.combined?.means ?? []);
  note(result.germination?.byEntry ?? []);
  note(result.germination?.bySite ?? []);
  note(result.emergence?.kinetics ?? []);
  note(result.plots);
  const codes = [...new Set(codeOf.values())].sort();
  const blindId = (entryId: number) => codes.indexOf(codeOf.get(entryId)!) + 1;
  const byCode = <T extends { blindCode: string }>(rows: T[]) => [...rows].sort((a, b) => (a.blindCode < b.blindCode ? -1 : a.blindCode > b.blindCode ? 1 : 0));

  const mean = (m: EntryResult): Unkeyed<EntryResult> => ({ entryId: blindId(m.entryId), blindCode: m.blindCode, mean: m.mean, lsMean: m.lsMean, se: m.se, n: m.n, letter: m.letter, rank: m.rank });
  const block = (b: AnalysisBlock): BlindAnalysisBlock => blockView(b, byCode(b.means).map(mean));
  const germ = (g: GerminationRow): Unkeyed<GerminationRow> => ({ entryId: blindId(g.entryId), blindCode: g.blindCode, siteId: g.siteId, siteName: g.siteName, sown: g.sown, emerged: g.emerged, percent: g.percent, lower: g.lower, upper: g.upper });
  const { combined, germination, emergence, trait: t, settings: st, explanations: ex } = result;

  const view: BlindAnalysisPayload = {
    blind: true,
    trial: { id: result.trial.id, code: result.trial.code, title: result.trial.title, crop: result.trial.crop, status: result.trial.status },
    settings: { traitId: st.traitId, siteIds: st.siteIds && [...st.siteIds], includeUnaccepted: st.includeUnaccepted, siteModel: st.siteModel, separation: st.separation },
    trait: { id: t.id, code: t.code, name: t.name, unit: t.unit, valueType: t.valueType, computation: t.computation, betterWhen: t.betterWhen, analysedAs: t.analysedAs },
    traits: result.traits.map((x) => ({ id: x.id, name: x.name, analysable: x.analysable })),
    sites: result.sites.map((x) => ({ id: x.id, name: x.name, status: x.status, included: x.included, shared: x.shared, why: x.why })),
    perSite: result.perSite.map((s) => ({ siteId: s.siteId, siteName: s.siteName, status: s.status, blocks: s.blocks, result: s.result && block(s.result), problem: s.problem })),
    combined: combined && {
      ...block(combined),
      siteModel: combined.siteModel,
      sites: combined.sites,
      interactionF: combined.interactionF,
      interactionP: combined.interactionP,
      bartlett: combined.bartlett && { statistic: combined.bartlett.statistic, df: combined.bartlett.df, p: combined.bartlett.p },
      cellMeans: combined.cellMeans
        .map((c) => ({ siteId: c.siteId, siteName: c.siteName, entryId: blindId(c.entryId), mean: c.mean, n: c.n }))
        .sort((a, b) => a.siteName.localeCompare(b.siteName) || a.entryId - b.entryId),
      stability: combined.stability && {
        sites: combined.stability.sites,
        rows: byCode(combined.stability.rows).map((r) => ({
          entryId: blindId(r.entryId), blindCode: r.blindCode, mean: r.mean, slope: r.slope, slopeSe: r.slopeSe, slopeP: r.slopeP, deviationMs: r.deviationMs, deviationP: r.deviationP,
          ecovalence: r.ecovalence, shuklaVariance: r.shuklaVariance, slopeReading: r.slopeReading, scattered: r.scattered, reading: r.reading,
        })),
        gge: {
          explained: [combined.stability.gge.explained[0], combined.stability.gge.explained[1]],
          entries: byCode(combined.stability.gge.entries).map((g) => ({ entryId: blindId(g.entryId), blindCode: g.blindCode, pc1: g.pc1, pc2: g.pc2 })),
          sites: [...combined.stability.gge.sites].sort((a, b) => a.siteName.localeCompare(b.siteName)).map((g) => ({ siteId: g.siteId, siteName: g.siteName, pc1: g.pc1, pc2: g.pc2 })),
        },
        notes: [...combined.stability.notes],
      },
      stabilityProblem: combined.stabilityProblem,
    },
    combinedProblem: result.combinedProblem,
    missing: result.missing.map((m) => ({ plotCode: m.plotCode, siteName: m.siteName, blindCode: m.blindCode, block: m.block, reason: m.reason, handling: m.handling })),
    exclusions: result.exclusions.map((x) => ({
      id: x.id,
      siteId: x.siteId,
      plotId: x.plotId,
      traitId: x.traitId,
      // The category is one of a fixed list of words, so it cannot name a variety; the staff's note never leaves the portal's staff.
      category: x.category,
      note: null,
      createdAt: x.createdAt,
      createdBy: null,
      siteName: x.siteName,
      plotCode: x.plotCode,
      traitName: x.traitName,
      publicReason: x.publicReason,
    })),
    warnings: [...result.warnings],
    notes: [...result.notes],
    explanations: { siteModel: ex.siteModel, separation: ex.separation, missing: ex.missing, unaccepted: ex.unaccepted, cv: ex.cv },
    // The label comparison is left out whole: label germination and seed lots tell packets apart.
    germination: germination && {
      byEntry: byCode(germination.byEntry).map(germ),
      bySite: [...germination.bySite].sort((a, b) => (a.siteName ?? "").localeCompare(b.siteName ?? "") || a.blindCode.localeCompare(b.blindCode)).map(germ),
      chiSquare: germination.chiSquare && { statistic: germination.chiSquare.statistic, df: germination.chiSquare.df, p: germination.chiSquare.p, lowExpected: germination.chiSquare.lowExpected, cells: germination.chiSquare.cells },
      cmh: germination.cmh && { statistic: germination.cmh.statistic, df: germination.cmh.df, p: germination.cmh.p, sites: germination.cmh.sites },
      note: germination.note.replace(LABEL_COMPARISON_NOTE, "").trim(),
    },
    emergence: emergence && {
      days: [...emergence.days],
      curve: byCode(emergence.curve).map((c) => ({ entryId: blindId(c.entryId), blindCode: c.blindCode, day: c.day, percent: c.percent, plots: c.plots })),
      kinetics: byCode(emergence.kinetics).map((k) => ({ entryId: blindId(k.entryId), blindCode: k.blindCode, meanEmergenceTime: k.meanEmergenceTime, t50: k.t50, finalPercent: k.finalPercent, plots: k.plots })),
      note: emergence.note,
    },
  };
  if (withPlots) {
    view.plots = result.plots.map((p) => ({ plotCode: p.plotCode, siteId: p.siteId, siteName: p.siteName, block: p.block, entryId: blindId(p.entryId), blindCode: p.blindCode, value: p.value, status: p.status }));
  }
  return view;
}
