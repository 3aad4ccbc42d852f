import { localeOr } from "./locales";
import type { Locale } from "@/lib/domain/vocabulary/enums";

/** Set by proxy.ts from the address on pages whose language the URL chooses; never taken from a client. */
export const LANGUAGE_HEADER = "x-seedplot-language";

/** The query parameter that chooses a public page's language. */
export const LANGUAGE_PARAM = "lang";

/**
 * Whether an address takes its language from the URL (public pages, sign-in) rather than from the signed-in
 * person's profile (the portal and its API routes).
 */
export function languageFromAddress(pathname: string): boolean {
  return !(pathname === "/portal" || pathname.startsWith("/portal/") || pathname.startsWith("/api/"));
}

/** The language a public address asks for: `?lang=es`; anything else is English. */
export const addressLocale = (search: URLSearchParams): Locale => localeOr(search.get(LANGUAGE_PARAM));

/** The same address in another language (English drops the parameter, so existing links stay canonical). */
export function withLanguage(pathAndQuery: string, locale: Locale): string {
  const url = new URL(pathAndQuery, "http://x");
  if (locale === "en") url.searchParams.delete(LANGUAGE_PARAM);
  else url.searchParams.set(LANGUAGE_PARAM, locale);
  return `${url.pathname}${url.search}`;
}
