import type { SubmissionStatus, TrialStatus } from "./enums";

// Every status a badge shows, with the words people read and the one tone it has everywhere: the trial
// list, a trial's page, the grower's sites, the review table and the analysis page all read from here.

/** How a status reads at a glance: good = done, warn = someone must act, info = moving along, bad = refused or missing. */
export type Tone = "neutral" | "good" | "warn" | "bad" | "info";

export const STATUS_LABELS: Record<TrialStatus, string> = {
  draft: "Draft",
  open: "Open",
  collecting: "Collecting data",
  analysing: "Analysing",
  published: "Published",
  archived: "Archived",
};

export const STATUS_TONES: Record<TrialStatus, Tone> = {
  draft: "neutral",
  open: "info",
  collecting: "info",
  analysing: "warn",
  published: "good",
  archived: "neutral",
};

/** A site's data for a trial, as its grower records and a coordinator reviews it. */
export const SUBMISSION_LABELS: Record<SubmissionStatus, string> = {
  draft: "Being recorded",
  submitted: "Sent for review",
  returned: "Returned for corrections",
  accepted: "Accepted",
};

export const SUBMISSION_TONES: Record<SubmissionStatus, Tone> = { draft: "neutral", submitted: "info", returned: "warn", accepted: "good" };

/**
 * Whether an enrolled site's data are in a published version, and why not. Only accepted data are
 * published; a site left out of every trait is "excluded".
 */
export type SiteInclusionReason = "accepted" | SubmissionStatus | "excluded" | "no_data";

/** Staff-facing words on the publish page; the review states stay in the portal. */
export const INCLUSION_LABELS: Record<SiteInclusionReason, string> = {
  accepted: "Included: data accepted",
  submitted: "Not included: sent for review, not accepted yet",
  returned: "Not included: returned to the grower for corrections",
  draft: "Not included: data still being recorded",
  excluded: "Not included: left out of every trait",
  no_data: "Not included: no data recorded",
};

export const INCLUSION_TONES: Record<SiteInclusionReason, Tone> = { accepted: "good", submitted: "warn", returned: "warn", draft: "warn", excluded: "bad", no_data: "bad" };

/** Why a site is not in the published results, as the public reads it: no review states, no names of people. */
export const PUBLIC_NOT_INCLUDED: Record<Exclude<SiteInclusionReason, "accepted" | "excluded">, string> = {
  submitted: "its data were not checked and accepted in time for this version",
  returned: "its data were not checked and accepted in time for this version",
  draft: "its data were not complete in time for this version",
  no_data: "no data were recorded",
};

/** Whether a season still takes new trials. */
export type SeasonState = "open" | "closed";
export const SEASON_STATE_LABELS: Record<SeasonState, string> = { open: "Open for new trials", closed: "Closed" };
export const SEASON_STATE_TONES: Record<SeasonState, Tone> = { open: "good", closed: "neutral" };

/**
 * Where a person's invitation stands: pending (the link works), expired (it ran out unused), used (they set
 * their password), cancelled (an admin stopped it, or a newer link replaced it and was not sent on).
 */
export type InvitationState = "pending" | "expired" | "used" | "cancelled";
export const INVITATION_LABELS: Record<InvitationState, string> = { pending: "Invitation pending", expired: "Invitation expired", used: "Invitation used", cancelled: "Invitation cancelled" };
export const INVITATION_TONES: Record<InvitationState, Tone> = { pending: "info", expired: "warn", used: "good", cancelled: "neutral" };
