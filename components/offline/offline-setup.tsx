"use client";

import { useEffect } from "react";
import { claimPhoneFor } from "./phone-store";

/**
 * On every signed-in page: registers the service worker (app/sw.ts, served at /sw.js) and makes sure the
 * pages the phone keeps are this person's (phone-store.ts).
 */
export function OfflineSetup({ userId }: { userId: number }) {
  useEffect(() => {
    void claimPhoneFor(userId);
    if ("serviceWorker" in navigator) navigator.serviceWorker.register("/sw.js", { scope: "/" }).catch(() => undefined);
  }, [userId]);
  return null;
}

/**
 * Asks the service worker to fetch and keep these addresses now, while there is a signal, so they open
 * without one even if the grower never opened them (lib/domain/offline.ts says which addresses it keeps).
 */
export function KeepReadyOffline({ userId, urls }: { userId: number; urls: string[] }) {
  const list = urls.join("\n");
  useEffect(() => {
    if (!("serviceWorker" in navigator) || !navigator.onLine) return;
    let cancelled = false;
    void (async () => {
      await claimPhoneFor(userId);
      const registration = await navigator.serviceWorker.ready;
      if (!cancelled) registration.active?.postMessage({ type: "CACHE_URLS", payload: { urlsToCache: list.split("\n") } });
    })();
    return () => {
      cancelled = true;
    };
  }, [userId, list]);
  return null;
}
