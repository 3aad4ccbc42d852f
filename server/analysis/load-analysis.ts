import "server-only";
import { createHash } from "node:crypto";
import { getAnalysisInput, getAnalysisTrialStatus, getAnalysisVersion, listAnalysisTraits, listTrialTraits } from "@/db/queries/analysis";
import { AppError } from "@/lib/errors";
import { runAnalysis } from "@/lib/domain/analysis/run";
import { mixedForTrial } from "@/lib/domain/analysis/mixed-trial";
import { analysisFor } from "@/lib/domain/analysis/blind";
import { siteSectionOf, toPageView, type SiteSection } from "@/lib/domain/analysis/page-view";
import { canSeeBlindKey, isStaff } from "@/lib/domain/permissions";
import type { AnalysisInput, AnalysisResult, AnalysisSettings, InputTrait, ViewerAnalysis } from "@/lib/domain/analysis/types";
import type { AnalysisQuery } from "@/lib/validation/analysis";
import type { Viewer } from "@/lib/domain/viewer";
import { isPublishableTrait, SEED_COUNT_TRAITS } from "@/lib/domain/vocabulary/traits";

// Results are kept per (trial, data version, settings): a new observation, review decision or
// exclusion changes the version, so stale results are never served, and old keys simply age out.
const CACHE_LIMIT = 200;
const cache = new Map<string, AnalysisResult>();

/** The trait shown when none is asked for: the first measured number with data, else any analysable trait with data. */
export function defaultTrait(traits: (InputTrait & { recorded: number })[]): InputTrait | null {
  const candidates = traits.filter(isPublishableTrait);
  return (
    candidates.find((t) => t.valueType === "number" && t.recorded > 0) ??
    candidates.find((t) => t.recorded > 0) ??
    candidates[0] ??
    null
  );
}

/**
 * One trait's analysis input as this viewer may read it. Until the trial is published a grower's input is
 * read without the blind key (no names, seed lots, check flags or label germination; no one but staff gets an exclusion's note),
 * and the result is stripped again by analysisFor: two locks, so one mistake cannot decode a blind code.
 * Null when the trial is not the viewer's.
 */
export async function loadAnalysisInput(viewer: Viewer, p: { trialId: number; traitId: number }): Promise<AnalysisInput | null> {
  const status = await getAnalysisTrialStatus(viewer, p.trialId);
  if (status === null) return null;
  return getAnalysisInput(viewer, { ...p, includeKey: canSeeBlindKey(viewer, { status }) });
}

/**
 * The trait asked for, checked against the trial's, or the default one. Counting each trait's values (to choose
 * the default) reads every observation of the trial, so that happens only when no trait is asked for. Null when
 * the trial is not the viewer's.
 */
async function chooseTrait(viewer: Viewer, trialId: number, asked: number | undefined): Promise<{ traitId: number; traits: InputTrait[] } | null> {
  if (asked === undefined) {
    const counted = await listAnalysisTraits(viewer, trialId);
    if (!counted) return null;
    const traitId = defaultTrait(counted)?.id;
    if (traitId === undefined) throw new AppError("conflict", "This trial records no traits yet, so there is nothing to analyse.");
    return { traitId, traits: counted };
  }
  const traits = await listTrialTraits(viewer, trialId);
  if (!traits) return null;
  if (!traits.some((t) => t.id === asked)) throw new AppError("bad_request", "That trait is not recorded in this trial. Choose one from the list.");
  return { traitId: asked, traits };
}

export interface PreparedAnalysis {
  settings: AnalysisSettings;
  /** names the result: trial, viewer scope, data version and settings */
  key: string;
  /** names the response: the key plus whether plot rows or the page's first view were asked for, since the bodies differ */
  etag: string;
  version: string;
}

/**
 * Resolves the settings and the cache tag without running the analysis, so a client that already
 * has this version gets a 304. Null when the trial is not the viewer's.
 */
export async function prepareAnalysis(viewer: Viewer, trialId: number, query: AnalysisQuery): Promise<PreparedAnalysis | null> {
  const chosen = await chooseTrait(viewer, trialId, query.trait);
  if (chosen === null) return null;
  const { traitId, traits } = chosen;
  const settings: AnalysisSettings = {
    traitId,
    siteIds: query.sites ? [...query.sites].sort((a, b) => a - b) : null,
    includeUnaccepted: query.unaccepted ?? false,
    siteModel: query.model ?? "random",
    separation: query.compare ?? "lsd",
    // staff only: a grower's view stays what it was (blind.ts builds theirs field by field)
    ...(query.mixed && isStaff(viewer) ? { mixed: true } : {}),
  };
  const read = traits.filter((t) => t.id === traitId || (SEED_COUNT_TRAITS as readonly string[]).includes(t.code)).map((t) => t.id);
  const version = await getAnalysisVersion(viewer, trialId, read);
  if (version === null) return null;
  // Staff and each cooperator see different slices of the trial, so the tag (and cache key) names the scope.
  const scope = viewer.role === "cooperator" ? `cooperator:${viewer.id}` : "staff";
  const key = createHash("sha1").update(`${trialId}|${scope}|${version}|${JSON.stringify(settings)}`).digest("base64url").slice(0, 27);
  return { settings, key, etag: `W/"${key}${query.plots ? "-plots" : query.page ? "-page" : ""}"`, version };
}

/** Runs (or reuses) the analysis for prepared settings. Null when the trial is not the viewer's. */
async function computeAnalysis(viewer: Viewer, trialId: number, prepared: PreparedAnalysis): Promise<AnalysisResult | null> {
  const key = `${trialId}|${prepared.key}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const input = await loadAnalysisInput(viewer, { trialId, traitId: prepared.settings.traitId });
  if (!input) return null;
  const plain = runAnalysis(input, prepared.settings);
  const result = prepared.settings.mixed ? { ...plain, ...mixedForTrial(plain) } : plain;
  cache.set(key, result);
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return result;
}

/**
 * The analysis for prepared settings as this viewer may see it (lib/domain/analysis/blind: blind codes only for
 * growers until the trial is published). What the JSON API and the page send. Null when not the viewer's.
 */
export async function viewAnalysis(viewer: Viewer, trialId: number, prepared: PreparedAnalysis, withPlots = false): Promise<ViewerAnalysis | null> {
  const result = await computeAnalysis(viewer, trialId, prepared);
  return result && analysisFor(viewer, result, withPlots);
}

/** Both steps as the viewer may see them, for the page's first render: its slim first view (lib/domain/analysis/page-view). */
export async function loadAnalysisView(viewer: Viewer, trialId: number, query: AnalysisQuery) {
  const prepared = await prepareAnalysis(viewer, trialId, { ...query, page: true });
  if (!prepared) return null;
  const view = await viewAnalysis(viewer, trialId, prepared);
  return view ? { view: toPageView(view), etag: prepared.etag } : null;
}

/**
 * One site's section of the analysis for the settings, as the viewer may see it (the page fetches it when the
 * section is opened). Null when the trial is not the viewer's or the site is not in its analysis: another
 * trial's site, a site left out, or a grower's site not shared with this grower all answer alike.
 */
export async function loadSiteSection(viewer: Viewer, trialId: number, siteId: number, query: AnalysisQuery): Promise<{ section: SiteSection; etag: string } | null> {
  const prepared = await prepareAnalysis(viewer, trialId, { ...query, plots: false, page: false });
  if (!prepared) return null;
  const view = await viewAnalysis(viewer, trialId, prepared);
  const section = view && siteSectionOf(view, siteId);
  return section ? { section, etag: `W/"${prepared.key}-site-${siteId}"` } : null;
}

/**
 * The whole result with plot rows and the key, for staff only (exports, variety histories); null for
 * anyone else, so a grower-facing path cannot reach it by mistake.
 */
export async function loadAnalysis(viewer: Viewer, trialId: number, query: AnalysisQuery) {
  if (!isStaff(viewer)) return null;
  const prepared = await prepareAnalysis(viewer, trialId, query);
  if (!prepared) return null;
  const result = await computeAnalysis(viewer, trialId, prepared);
  return result ? { result, etag: prepared.etag } : null;
}
