import { LOCALES, type Locale } from "@/lib/domain/vocabulary/enums";

// Which languages exist, without the catalogues: light enough for any client bundle.

export const DEFAULT_LOCALE: Locale = "en";

export const isLocale = (value: unknown): value is Locale => typeof value === "string" && (LOCALES as readonly string[]).includes(value);

/** A language from an untrusted string (a query parameter, a header), English when it is none of ours. */
export const localeOr = (value: unknown, fallback: Locale = DEFAULT_LOCALE): Locale => (isLocale(value) ? value : fallback);

/**
 * The catalogue namespaces client components read through next-intl; only these travel to the browser with a
 * page, so a public page carries no portal wording (nor words like review states) it does not show.
 */
export const CLIENT_NAMESPACES = ["common", "nav", "public", "account", "languages", "entry", "offline", "upload", "record"] as const;
