/** A public results address, /results/:code with an optional ?version=N, as the pages and downloads read it. */
export interface PublishedAddress {
  code: string;
  /** undefined = the latest live version */
  version: number | undefined;
}

/** Trial codes such as TV26-LET. */
const TRIAL_CODE = /^[A-Za-z0-9-]{1,40}$/;
const MAX_VERSION = 100_000;

/**
 * Reads a trial code and the raw ?version= value (absent = latest). Null when either is malformed, so
 * every caller answers the same plain 404 and a guessed address reveals nothing.
 */
export function parsePublishedAddress(code: string, version: string | null | undefined): PublishedAddress | null {
  if (!TRIAL_CODE.test(code)) return null;
  if (version === null || version === undefined) return { code, version: undefined };
  const n = Number(version);
  if (!Number.isInteger(n) || n < 1 || n > MAX_VERSION) return null;
  return { code, version: n };
}
