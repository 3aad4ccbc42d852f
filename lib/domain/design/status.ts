import type { TrialStatus } from "@/lib/domain/vocabulary/enums";

// What a coordinator may change at each stage of a trial. Blind codes, plots and data hang off the
// entry list and the design, so those freeze as soon as any site has a layout.

export interface TrialState {
  status: TrialStatus;
  /** Sites with a stored layout. */
  randomisedSites: number;
  /** Observations recorded at any site. */
  observationCount: number;
}

const SETUP: TrialStatus[] = ["draft", "open"];

/** Entries, design, blocks and plot unit may change only before any site is laid out. */
export const canEditDesign = (t: TrialState) => SETUP.includes(t.status) && t.randomisedSites === 0;

/** Why the design is locked, in the coordinator's words, or null when it is editable. */
export function designLockReason(t: TrialState): string | null {
  if (!SETUP.includes(t.status)) return "Entries and design can only change while the trial is a draft or open.";
  if (t.randomisedSites > 0) return "Entries and design are frozen because plots have been laid out at a site.";
  return null;
}

/** Traits to record may still be added while data collection has not started. */
export const canEditTraits = (t: TrialState) => SETUP.includes(t.status) && t.observationCount === 0;

/** Sites may join while the trial is being set up or is collecting (a late site still gets its own layout). */
export const canEnrolSites = (t: TrialState) => ["draft", "open", "collecting"].includes(t.status);

/** A site may be (re-)randomised until data exist for it. */
export const canRandomiseSite = (t: { status: TrialStatus }, siteObservationCount: number) =>
  ["draft", "open", "collecting"].includes(t.status) && siteObservationCount === 0;

/**
 * A site's sowing date may be corrected until results are published: published reports carry the days
 * counted from it, and archived trials are closed.
 */
export const canChangeSowingDate = (t: { status: TrialStatus }) => !["published", "archived"].includes(t.status);

const NEXT: Partial<Record<TrialStatus, TrialStatus>> = {
  draft: "open",
  open: "collecting",
  collecting: "analysing",
  analysing: "published",
  published: "archived",
};

/** The status a trial moves on to, or null at the end. */
export const nextStatus = (s: TrialStatus): TrialStatus | null => NEXT[s] ?? null;

/** Checks a move to the next status; returns the reason it is refused, or null when it is allowed. */
export function statusChangeProblem(t: TrialState & { entries: number; traits: number; sites: number }, to: TrialStatus): string | null {
  if (nextStatus(t.status) !== to && !(t.status === "open" && to === "draft")) return "A trial moves one step at a time.";
  if (to === "draft" && t.randomisedSites > 0) return "This trial cannot go back to draft because sites already have layouts.";
  if (to === "open" && t.entries < 2) return "Add at least two entries before opening the trial.";
  if (to === "open" && t.traits < 1) return "Choose at least one trait to record before opening the trial.";
  if (to === "collecting" && (t.sites === 0 || t.randomisedSites < t.sites)) return "Every enrolled site needs a layout before data collection starts.";
  return null;
}

/** What each stage of a trial means and allows, as the trial page states it. */
export const STAGE_MEANINGS: Record<TrialStatus, string> = {
  draft: "Set-up. Entries, design and traits can change. Growers see nothing of the trial yet.",
  open: "Kits out. Growers see their site, its maps, labels and form, and can record from sowing on. Entries and design can still change until a site is laid out.",
  collecting: "Recording. Every site is laid out; growers record and send their data for review. A late site can still join.",
  analysing: "Review and analysis. You accept or return each site's data; unfinished or returned data can still be completed. Publishing is possible from here.",
  published: "Results are public. Values are locked; a new version can be published after a correction, or the results withdrawn.",
  archived: "Closed. Nothing changes any more; published results stay public.",
};

/**
 * Results are published only after the data review step (analysing), or as a new version of published
 * results; a trial still recording cannot go straight to the public.
 */
export const canPublish = (status: TrialStatus) => status === "analysing" || status === "published";

/** Why a trial cannot be published now, in the coordinator's words, or null. */
export function publishBlockReason(status: TrialStatus): string | null {
  if (canPublish(status)) return null;
  if (status === "archived") return "An archived trial cannot be published.";
  if (status === "draft") return "A draft trial has no data to publish.";
  return "Move the trial to Analysing first: that is the review step, where you accept each site's data, and results are published from there.";
}
