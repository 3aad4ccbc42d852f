"use client";
import { useEffect, useRef } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import type { SiteLayout, TrialDetail } from "@/db/queries/trials";
import type { ActionResult } from "@/lib/validation/action-result";
import type { Jsonified } from "@/lib/domain/json";

// The coordinator's trial page reads its entries, sites and layouts from the JSON API, so a change made
// by a form on the page shows up by refetching rather than by reloading the page.

export type TrialDetailJson = Jsonified<TrialDetail>;
/** What the layout route answers: the site layout without its internal enrolment id. */
export type SiteLayoutJson = Omit<Jsonified<SiteLayout>, "enrolmentId">;

export const trialKeys = {
  all: (trialId: number) => ["trial", trialId] as const,
  detail: (trialId: number) => ["trial", trialId, "detail"] as const,
  layout: (trialId: number, siteId: number) => ["trial", trialId, "layout", siteId] as const,
};

async function getJson<T>(url: string, fallback: string): Promise<T> {
  const res = await fetch(url, { headers: { Accept: "application/json" } });
  const body = await res.json().catch(() => null);
  if (!res.ok) throw new Error((body as { error?: string } | null)?.error ?? fallback);
  return body as T;
}

/** Entries (with the blind-code key) and enrolled sites: GET /api/trials/:id, first painted by the server. */
export function useTrialDetail(trialId: number, initial: TrialDetailJson) {
  return useQuery({
    queryKey: trialKeys.detail(trialId),
    queryFn: () => getJson<TrialDetailJson>(`/api/trials/${trialId}`, "The trial could not be loaded. Try again in a moment."),
    initialData: initial,
  });
}

/** One site's plots: GET /api/trials/:id/sites/:siteId/layout, fetched when the coordinator opens it. */
export function useSiteLayout(trialId: number, siteId: number) {
  return useQuery({
    queryKey: trialKeys.layout(trialId, siteId),
    queryFn: () => getJson<SiteLayoutJson>(`/api/trials/${trialId}/sites/${siteId}/layout`, "The layout could not be loaded. Try again in a moment."),
  });
}

/**
 * After a server action on this trial succeeds, refetch everything the page fetched for it. Runs once per
 * result, and `then` lets the caller react too (e.g. open the new layout).
 */
export function useRefetchTrialAfter(trialId: number, state: ActionResult | null, then?: () => void) {
  const client = useQueryClient();
  const handled = useRef<ActionResult | null>(null);
  useEffect(() => {
    if (!state?.ok || handled.current === state) return;
    handled.current = state;
    void client.invalidateQueries({ queryKey: trialKeys.all(trialId) });
    then?.();
  }, [state, client, trialId, then]);
}
