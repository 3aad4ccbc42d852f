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
