/**
 * Why an analysis could not be run. Each code maps to one kind of bad input so that
 * pages and API routes can react to it without parsing the message.
 */
export type StatsErrorCode =
  | "TOO_FEW_ENTRIES"
  | "TOO_FEW_GROUPS"
  | "EMPTY_ENTRY"
  | "EMPTY_BLOCK"
  | "EMPTY_SITE"
  | "NON_FINITE_VALUE"
  | "INVALID_LABEL"
  | "NO_RESIDUAL_DF"
  | "NO_VARIATION"
  | "INVALID_COUNT"
  | "EMERGED_EXCEEDS_SOWN"
  | "EMPTY_TABLE_ROW"
  | "EMPTY_TABLE_COLUMN"
  | "TABLE_SHAPE"
  | "INVALID_PROBABILITY"
  | "INVALID_ARGUMENT"
  | "NOT_ESTIMABLE";

/**
 * Thrown by every function in lib/domain/stats when the input cannot be analysed. `message` is a
 * plain-language sentence fit to show a trial coordinator; `details` carries the offending
 * entry, block, row index or value for programmatic use.
 */
export class StatsError extends Error {
  readonly code: StatsErrorCode;
  readonly details: Record<string, unknown>;

  constructor(code: StatsErrorCode, message: string, details: Record<string, unknown> = {}) {
    super(message);
    this.name = "StatsError";
    this.code = code;
    this.details = details;
  }
}

/** True when `error` is a StatsError (optionally of the given code). */
export function isStatsError(error: unknown, code?: StatsErrorCode): error is StatsError {
  return error instanceof StatsError && (code === undefined || error.code === code);
}
