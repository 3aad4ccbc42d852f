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
