// What the phone keeps for recording without a signal: shared by the service worker (app/sw.ts), the pages
// that ask it to keep a site ready, and the sign-out that empties it. Change the kept routes here only.

/** Caches of one person's own pages and sheets: emptied at sign-out and when someone else signs in on the phone. */
export const PAGE_CACHE = "seedplot-pages";
export const SHEET_CACHE = "seedplot-sheets";
export const PERSONAL_CACHES = [PAGE_CACHE, SHEET_CACHE] as const;
/** Shell files that are the same for everyone (icons, fonts); the build's scripts and styles are precached. */
export const SHELL_CACHE = "seedplot-shell";

/** The portal home, the list of sites to record and each site's recording page. */
export function isOfflinePage(pathname: string): boolean {
  return pathname === "/portal" || pathname === "/portal/record" || /^\/portal\/record\/\d+\/\d+$/.test(pathname);
}

/** A site's recording sheet as JSON (`/api/observations?trialId=&siteId=`) and its spreadsheet to fill in. */
export function isOfflineSheet(pathname: string): boolean {
  return pathname === "/api/observations" || /^\/api\/record\/\d+\/\d+\/template$/.test(pathname);
}

/** Addresses to keep ready for one site, so it opens without a signal even if it was never opened before. */
export function offlineUrlsForSite(trialId: number, siteId: number): string[] {
  return [`/portal/record/${trialId}/${siteId}`, `/api/observations?trialId=${trialId}&siteId=${siteId}`];
}

/** The IndexedDB database holding values typed on this phone and not yet saved, by person and site. */
export const PHONE_DB = "seedplot-phone";
export const PHONE_STORE = "unsaved";
export const phoneQueueKey = (userId: number, trialId: number, siteId: number) => `${userId}:${trialId}:${siteId}`;
/** Key of the id of the person whose pages the phone keeps. */
export const PHONE_OWNER_KEY = "owner";
