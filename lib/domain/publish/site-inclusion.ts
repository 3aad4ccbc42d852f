/**
 * Which enrolled sites a published version includes, and why the others are not in it. Publishing reads
 * accepted data only, so a site is included when its data are accepted, it has data, and no exclusion
 * leaves the whole site out of every trait. The publish page, the server's guard, the snapshot and the
 * notices all decide from this one function.
 */
import type { ExclusionCategory, SubmissionStatus } from "@/lib/domain/vocabulary/enums";
import { EXCLUSION_CATEGORY_LABELS } from "@/lib/domain/vocabulary/labels";
import { INCLUSION_LABELS, PUBLIC_NOT_INCLUDED, type SiteInclusionReason } from "@/lib/domain/vocabulary/statuses";

export interface SiteForInclusion {
  siteId: number;
  siteName: string;
  status: SubmissionStatus;
  /** observations recorded at the site (any trait) */
  values: number;
  /** the category of an exclusion that leaves the whole site out of every trait, if any */
  excludedAs: ExclusionCategory | null;
}

export interface SiteInclusion {
  siteId: number;
  siteName: string;
  included: boolean;
  reason: SiteInclusionReason;
  /** set when reason is "excluded" */
  category: ExclusionCategory | null;
}

export function siteInclusion(sites: SiteForInclusion[]): SiteInclusion[] {
  return sites.map((s) => {
    const reason: SiteInclusionReason = s.excludedAs !== null ? "excluded" : s.values === 0 ? "no_data" : s.status === "accepted" ? "accepted" : s.status;
    return { siteId: s.siteId, siteName: s.siteName, included: reason === "accepted", reason, category: s.excludedAs };
  });
}

/** The site-wide, all-trait exclusion of each site (the latest one recorded), for siteInclusion. */
export function wholeSiteExclusions(exclusions: { siteId: number | null; plotId: number | null; traitId: number | null; category: ExclusionCategory }[]): Map<number, ExclusionCategory> {
  const out = new Map<number, ExclusionCategory>();
  for (const x of exclusions) if (x.siteId !== null && x.plotId === null && x.traitId === null) out.set(x.siteId, x.category);
  return out;
}

/** How the publish page words a site's inclusion. */
export function inclusionWords(s: SiteInclusion): string {
  return s.reason === "excluded" && s.category ? `${INCLUSION_LABELS.excluded} (${EXCLUSION_CATEGORY_LABELS[s.category]})` : INCLUSION_LABELS[s.reason];
}

/** Why a site is not in the published results, in public words. */
export function publicNotIncludedWhy(s: Pick<SiteInclusion, "reason" | "category">): string {
  if (s.reason === "excluded") return `left out: ${EXCLUSION_CATEGORY_LABELS[s.category ?? "other"]}`;
  if (s.reason === "accepted") return "";
  return PUBLIC_NOT_INCLUDED[s.reason];
}

/**
 * What a published "not included" reason says, read back from its words (published versions store them in
 * English), so a page in another language can word it again; null for words of another form.
 */
export function notIncludedKind(why: string): { why: "unchecked" | "incomplete" | "noData" } | { category: ExclusionCategory } | null {
  if (why === PUBLIC_NOT_INCLUDED.submitted) return { why: "unchecked" };
  if (why === PUBLIC_NOT_INCLUDED.draft) return { why: "incomplete" };
  if (why === PUBLIC_NOT_INCLUDED.no_data) return { why: "noData" };
  const category = (Object.keys(EXCLUSION_CATEGORY_LABELS) as ExclusionCategory[]).find((c) => why === `left out: ${EXCLUSION_CATEGORY_LABELS[c]}`);
  return category ? { category } : null;
}

/** The ids of the sites a publication would leave out, sorted. */
export function leftOutSiteIds(inclusion: SiteInclusion[]): number[] {
  return inclusion.filter((s) => !s.included).map((s) => s.siteId).sort((a, b) => a - b);
}

/** True when a confirmation names exactly these left-out sites (order and repeats aside). */
export function confirmsExactly(confirmed: number[], leftOut: number[]): boolean {
  const a = [...new Set(confirmed)].sort((x, y) => x - y);
  return a.length === leftOut.length && a.every((id, i) => id === leftOut[i]);
}
