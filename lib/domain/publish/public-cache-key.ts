import { LANGUAGE_PARAM } from "../i18n/language-choice";

// Which public addresses may be answered from the shared public cache (server/publish/public-cache.ts), and
// under which key. Only the addresses below, and only with the query parameters each page or route reads
// (each at most once, in a plain form), are cached; anything else is rendered as before. The key is the
// address as asked (path and query string), since Next writes the address into the page it renders.

const TRIAL_CODE = "[A-Za-z0-9-]{1,40}";
const ID = "[1-9][0-9]{0,9}";
const FILTERS = ["q", "crop", "season"] as const;
// Public pages name their language in the address (?lang=es), so each language is its own cached copy.
const LANGUAGE = LANGUAGE_PARAM;

const CACHEABLE: { path: RegExp; params: readonly string[] }[] = [
  { path: /^\/$/, params: [LANGUAGE] },
  { path: /^\/results$/, params: [...FILTERS, LANGUAGE] },
  { path: new RegExp(`^/results/${TRIAL_CODE}$`), params: ["version", LANGUAGE] },
  { path: new RegExp(`^/varieties/${ID}$`), params: [LANGUAGE] },
  { path: new RegExp(`^/sites/${ID}$`), params: [LANGUAGE] },
  { path: /^\/api\/public\/v1\/trials$/, params: FILTERS },
  { path: new RegExp(`^/api/public/v1/trials/${TRIAL_CODE}(?:/results|/plots)?$`), params: ["version"] },
  { path: /^\/api\/public\/v1\/openapi\.json$/, params: [] },
];

const PLAIN_VALUE: Record<string, RegExp> = {
  version: /^[1-9][0-9]{0,5}$/,
  [LANGUAGE]: /^(?:en|es)$/,
};
const MAX_VALUE_LENGTH = 100;

/**
 * The cache key of a public address, or null when the address is not one the public cache keeps (a
 * portal page, an unknown query parameter, a repeated or over-long one, a version that is not a plain
 * number). Null never refuses anything: the address is rendered as it always was.
 */
export function publicCacheKey(pathname: string, search: string): string | null {
  const route = CACHEABLE.find((r) => r.path.test(pathname));
  if (!route) return null;
  const query = new URLSearchParams(search);
  const seen = new Set<string>();
  for (const [name, value] of query) {
    if (!route.params.includes(name) || seen.has(name)) return null;
    seen.add(name);
    if (value.length > MAX_VALUE_LENGTH) return null;
    const plain = PLAIN_VALUE[name];
    if (plain && !plain.test(value)) return null;
  }
  return seen.size === 0 ? pathname : `${pathname}${search.startsWith("?") ? search : `?${search}`}`;
}
