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
