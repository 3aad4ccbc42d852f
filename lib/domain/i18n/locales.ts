import { LOCALES, type Locale } from "@/lib/domain/vocabulary/enums";

// Which languages exist, without the catalogues: light enough for any client bundle.

export const DEFAULT_LOCALE: Locale = "en";

export const isLocale = (value: unknown): value is Locale => typeof value === "string" && (LOCALES as readonly string[]).includes(value);

/** A language from an untrusted string (a query parameter, a header), English when it is none of ours. */
export const localeOr = (value: unknown, fallback: Locale = DEFAULT_LOCALE): Locale => (isLocale(value) ? value : fallback);

/**
 * What of the catalogue travels to the browser with a page: the namespaces only client components read, and
 * from the namespaces server components share (nav, public) just the keys client components use. So a page
 * carries no wording it does not show (a public page no portal words, a live page no withdrawal notice).
 */
export const CLIENT_NAMESPACES = ["frame", "common", "account", "languages", "entry", "offline", "upload", "record", "photos", "files", "pageErrors"] as const;
export const CLIENT_KEYS: Record<string, readonly string[]> = {
  nav: ["signOut"],
  public: ["switchTo"],
};

/** Namespaces only some layouts' client components read, sent by those layouts alone (app/(auth), app/(public)). */
export const AUTH_CLIENT_NAMESPACES = ["auth"] as const;
export const PUBLIC_CLIENT_NAMESPACES = ["publicTables", "figures", "units"] as const;

/** The part of a catalogue sent to client components, with the `extra` namespaces a layout adds for its own. */
export function clientMessages<T extends Record<string, unknown>>(messages: T, extra: readonly string[] = []): Record<string, unknown> {
  const picked: Record<string, unknown> = Object.fromEntries([...CLIENT_NAMESPACES, ...extra].map((ns) => [ns, messages[ns]]));
  for (const [ns, keys] of Object.entries(CLIENT_KEYS)) {
    const all = (messages[ns] ?? {}) as Record<string, unknown>;
    picked[ns] = Object.fromEntries(keys.filter((k) => k in all).map((k) => [k, all[k]]));
  }
  return picked;
}
