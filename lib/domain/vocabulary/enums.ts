// Enum values shared by the database columns, zod schemas and the UI, so they cannot drift apart.

export const ROLES = ["admin", "coordinator", "cooperator"] as const;
export type Role = (typeof ROLES)[number];

/** The languages Seedplot speaks to growers and the public; the first is the default. */
export const LOCALES = ["en", "es"] as const;
export type Locale = (typeof LOCALES)[number];

export const SITE_KINDS = ["farm", "garden"] as const;
export const GROWING_SETUPS = ["indoor_lights", "greenhouse", "high_tunnel", "field"] as const;
export type GrowingSetup = (typeof GROWING_SETUPS)[number];

export const CROP_GROUPS = [
  "leafy_greens",
  "brassicas",
  "legumes",
  "roots",
  "alliums",
  "fruiting",
  "herbs",
  "flowers",
] as const;
export type CropGroup = (typeof CROP_GROUPS)[number];

export const TRAIT_TYPES = ["count", "date", "number", "rating", "yes_no", "text"] as const;
export type TraitType = (typeof TRAIT_TYPES)[number];

/** Which way a trait's analysed value is better: yield higher, days to emergence lower, days to maturity neither. */
export const BETTER_WHEN = ["higher", "lower", "neither"] as const;
export type BetterWhen = (typeof BETTER_WHEN)[number];

/** How a trait's analysed value is derived from what the grower records. */
export const TRAIT_COMPUTATIONS = ["none", "days_from_sowing", "days_from_transplant"] as const;
export type TraitComputation = (typeof TRAIT_COMPUTATIONS)[number];

export const TRIAL_DESIGNS = ["rcbd", "crd"] as const;
export type TrialDesign = (typeof TRIAL_DESIGNS)[number];

export const PLOT_UNITS = ["insert", "cells", "bed_row"] as const;
export type PlotUnit = (typeof PLOT_UNITS)[number];

export const TRIAL_STATUSES = ["draft", "open", "collecting", "analysing", "published", "archived"] as const;
export type TrialStatus = (typeof TRIAL_STATUSES)[number];

export const SUBMISSION_STATUSES = ["draft", "submitted", "returned", "accepted"] as const;
export type SubmissionStatus = (typeof SUBMISSION_STATUSES)[number];

export const TOKEN_KINDS = ["invite", "password_reset"] as const;
export type TokenKind = (typeof TOKEN_KINDS)[number];

export const MAIL_STATUSES = ["pending", "sent", "failed"] as const;

export const MISSING_REASONS = ["not_sown", "died", "animal_damage", "lost_label", "weather", "other"] as const;

/** Why a site or plot is left out of an analysis, as the public reads it once results are published. */
export const EXCLUSION_CATEGORIES = ["plot_damaged", "not_sown", "seed_mix_up", "protocol_not_followed", "site_data_incomplete", "other"] as const;
export type ExclusionCategory = (typeof EXCLUSION_CATEGORIES)[number];
