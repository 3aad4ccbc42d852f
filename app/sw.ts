/// <reference lib="webworker" />
// The service worker, built with Serwist by scripts/build-service-worker.ts after `next build` (which injects
// the list of the build's scripts and styles) and served at /sw.js by app/sw.js/route.ts. Not part of the
// Next bundle. What it keeps for recording without a signal is listed in lib/domain/offline.ts.
import { CacheFirst, NetworkFirst, Serwist, type PrecacheEntry, type SerwistPlugin } from "serwist";
import { isOfflinePage, isOfflineSheet, PAGE_CACHE, SHEET_CACHE, SHELL_CACHE } from "@/lib/domain/offline";

const sw = self as unknown as ServiceWorkerGlobalScope;
// Written out as `self.__SW_MANIFEST`: the build step finds this exact text and puts the precache list there.
const precacheEntries = (self as unknown as { __SW_MANIFEST: (PrecacheEntry | string)[] | undefined }).__SW_MANIFEST;

// Only a page the person really got is kept: never a redirect to sign-in, an error or a not-found.
const onlyTheRealPage: SerwistPlugin = {
  cacheWillUpdate: async ({ response }) => (response.status === 200 && !response.redirected && !response.headers.has("x-nextjs-redirect") ? response : null),
};

// A label scan opens one plot (`?plot=`); without a signal the site's whole kept page stands in for it.
const wholeSiteWithoutSignal: SerwistPlugin = {
  handlerDidError: async ({ request }) => {
    const url = new URL(request.url);
    if (!url.search) return undefined;
    const cache = await caches.open(PAGE_CACHE);
    return cache.match(url.origin + url.pathname);
  },
};

const isPlainGet = (request: Request, url: URL) =>
  request.method === "GET" && url.origin === sw.location.origin && !url.searchParams.has("_rsc") && !request.headers.has("RSC");

const serwist = new Serwist({
  precacheEntries,
  skipWaiting: true,
  clientsClaim: true,
  navigationPreload: false,
  runtimeCaching: [
    // Recording pages: the network first, so the page always shows what is saved when there is a signal;
    // the kept copy only when there is none, or when a weak signal has not answered in 20 s.
    { matcher: ({ request, url }) => isPlainGet(request, url) && isOfflinePage(url.pathname), handler: new NetworkFirst({ cacheName: PAGE_CACHE, networkTimeoutSeconds: 20, plugins: [onlyTheRealPage, wholeSiteWithoutSignal] }) },
    { matcher: ({ request, url }) => isPlainGet(request, url) && isOfflineSheet(url.pathname), handler: new NetworkFirst({ cacheName: SHEET_CACHE, networkTimeoutSeconds: 20, plugins: [onlyTheRealPage] }) },
    // The same for everyone: fonts and icons.
    {
      matcher: ({ request, url }) => isPlainGet(request, url) && (url.pathname.startsWith("/fonts/") || url.pathname.startsWith("/icons/")),
      handler: new CacheFirst({ cacheName: SHELL_CACHE, plugins: [onlyTheRealPage] }),
    },
  ],
});

serwist.addEventListeners();
