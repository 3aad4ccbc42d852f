import "server-only";
import { headers } from "next/headers";
import { getRequestConfig } from "next-intl/server";
import { CATALOGUES, localeOr } from "@/lib/domain/i18n/catalogue";
import { LANGUAGE_HEADER } from "@/lib/domain/i18n/language-choice";
import { getViewer } from "@/server/auth/guards";

/**
 * The language of one request. Public pages carry it in their address (`?lang=es`), which proxy.ts copies
 * into LANGUAGE_HEADER (dropping any the client sent), so a cached public page varies only by its URL.
 * The portal speaks each person's own language from their profile.
 */
export default getRequestConfig(async () => {
  const fromAddress = (await headers()).get(LANGUAGE_HEADER);
  const locale = fromAddress !== null ? localeOr(fromAddress) : await profileLocale();
  return { locale, messages: CATALOGUES[locale], timeZone: "UTC" };
});

/**
 * The signed-in person's language, English for a visitor. The root layout asks this before any page runs, so a
 * database outage must not fail it here: the page's own guard reads the same (memoised) viewer and answers the
 * outage as it always does, through its error boundary.
 */
async function profileLocale() {
  try {
    return localeOr((await getViewer())?.locale);
  } catch {
    return localeOr(null);
  }
}
