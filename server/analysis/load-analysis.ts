import "server-only";
import { createHash } from "node:crypto";
import { countRecordedValues, getAnalysisAccess, readAnalysisInput, readAnalysisVersion, type AnalysisAccess } from "@/db/queries/analysis";
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
  const access = await getAnalysisAccess(viewer, p.trialId);
  return access && inputFor(access, p.traitId);
}

function inputFor(access: AnalysisAccess, traitId: number): Promise<AnalysisInput> {
  return readAnalysisInput(access, { traitId, includeKey: canSeeBlindKey(access.viewer, { status: access.trial.status }) });
}

/**
 * The trait asked for, checked against the trial's, or the default one. Counting each trait's values (to choose
 * the default) reads every observation of the trial, so that happens only when no trait is asked for.
 */
async function chooseTrait(access: AnalysisAccess, asked: number | undefined): Promise<number> {
  if (asked === undefined) {
    const traitId = defaultTrait(await countRecordedValues(access))?.id;
    if (traitId === undefined) throw new AppError("conflict", "This trial records no traits yet, so there is nothing to analyse.");
    return traitId;
  }
  if (!access.traits.some((t) => t.id === asked)) throw new AppError("bad_request", "That trait is not recorded in this trial. Choose one from the list.");
  return asked;
}

export interface PreparedAnalysis {
  settings: AnalysisSettings;
  /** names the result: trial, viewer scope, data version and settings */
  key: string;
  /** names the response: the key plus whether plot rows or the page's first view were asked for, since the bodies differ */
  etag: string;
  version: string;
  /** the one access check of this request (trial, sites in scope, traits), reused by the steps after it */
  access: AnalysisAccess;
}

/**
 * Checks the viewer's access once and resolves the settings and the cache tag without running the analysis,
 * so a client that already has this version gets a 304. Null when the trial is not the viewer's.
 */
export async function prepareAnalysis(viewer: Viewer, trialId: number, query: AnalysisQuery): Promise<PreparedAnalysis | null> {
  const access = await getAnalysisAccess(viewer, trialId);
  if (access === null) return null;
  const traitId = await chooseTrait(access, query.trait);
  const settings: AnalysisSettings = {
    traitId,
    siteIds: query.sites ? [...query.sites].sort((a, b) => a - b) : null,
    includeUnaccepted: query.unaccepted ?? false,
    siteModel: query.model ?? "random",
    separation: query.compare ?? "lsd",
    // staff only: a grower's view stays what it was (blind.ts builds theirs field by field)
    ...(query.mixed && isStaff(viewer) ? { mixed: true } : {}),
  };
  const read = access.traits.filter((t) => t.id === traitId || (SEED_COUNT_TRAITS as readonly string[]).includes(t.code)).map((t) => t.id);
  const version = await readAnalysisVersion(access, read);
  // Staff and each cooperator see different slices of the trial, so the tag (and cache key) names the scope.
  const scope = viewer.role === "cooperator" ? `cooperator:${viewer.id}` : "staff";
  const key = createHash("sha1").update(`${trialId}|${scope}|${version}|${JSON.stringify(settings)}`).digest("base64url").slice(0, 27);
  return { settings, key, etag: `W/"${key}${query.plots ? "-plots" : query.page ? "-page" : ""}"`, version, access };
}

/** The input of the prepared analysis, read within the access it was prepared under (what a computation reads). */
export function loadPreparedInput(prepared: PreparedAnalysis): Promise<AnalysisInput> {
  return inputFor(prepared.access, prepared.settings.traitId);
}

/** Runs (or reuses) the analysis for prepared settings, within the access they were prepared under. */
async function computeAnalysis(prepared: PreparedAnalysis): Promise<AnalysisResult> {
  const key = `${prepared.access.trial.id}|${prepared.key}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const input = await loadPreparedInput(prepared);
  const plain = runAnalysis(input, prepared.settings);
  const result = prepared.settings.mixed ? { ...plain, ...mixedForTrial(plain) } : plain;
  cache.set(key, result);
  if (cache.size > CACHE_LIMIT) cache.delete(cache.keys().next().value!);
  return result;
}

/**
 * The analysis for prepared settings as their viewer may see it (lib/domain/analysis/blind: blind codes only for
 * growers until the trial is published). What the JSON API and the page send.
 */
export async function viewAnalysis(prepared: PreparedAnalysis, withPlots = false): Promise<ViewerAnalysis> {
  return analysisFor(prepared.access.viewer, await computeAnalysis(prepared), withPlots);
}

/** Both steps as the viewer may see them, for the page's first render: its slim first view (lib/domain/analysis/page-view). */
export async function loadAnalysisView(viewer: Viewer, trialId: number, query: AnalysisQuery) {
  const prepared = await prepareAnalysis(viewer, trialId, { ...query, page: true });
  if (!prepared) return null;
  return { view: toPageView(await viewAnalysis(prepared)), etag: prepared.etag };
}

/**
 * One site's section of the analysis for the settings, as the viewer may see it (the page fetches it when the
 * section is opened). Null when the trial is not the viewer's or the site is not in its analysis: another
 * trial's site, a site left out, or a grower's site not shared with this grower all answer alike.
 */
export async function loadSiteSection(viewer: Viewer, trialId: number, siteId: number, query: AnalysisQuery): Promise<{ section: SiteSection; etag: string } | null> {
  const prepared = await prepareAnalysis(viewer, trialId, { ...query, plots: false, page: false });
  if (!prepared) return null;
  const section = siteSectionOf(await viewAnalysis(prepared), siteId);
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
  return { result: await computeAnalysis(prepared), etag: prepared.etag };
}
