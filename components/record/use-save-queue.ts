"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import type { MissingReason } from "@/lib/domain/observations/missing";
import { afterSaved, readStoredQueue, saveOutcome, saveRequestBody, slotOf, storedQueueText, tokenOf, warningsFor, withoutSlot, withQueued, type Pending, type Queue, type SavedWarning, type SlotStatus } from "./save-queue";

const RETRY_MS = 20_000;

/**
 * Saves each value on its own; a save that fails for want of a connection stays in this device's storage
 * and is retried (every 20 s, when the browser comes back online, and on the next visit) until it lands.
 * `onRestore` gets the values left unsaved by an earlier visit, so the form can show them again.
 */
export function useSaveQueue(p: { trialId: number; siteId: number; initial: Record<string, string>; initialReasons: Record<string, MissingReason>; onRestore: (stored: Queue) => void }) {
  const { trialId, siteId } = p;
  const storageKey = `seedplot:unsaved:${trialId}:${siteId}`;
  const [queue, setQueue] = useState<Queue>({});
  const [status, setStatus] = useState<Record<string, SlotStatus>>({});
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [notice, setNotice] = useState<string | null>(null);
  // What the server found worth a second look in each slot's last saved value (it knows the packets).
  const [warnings, setWarnings] = useState<Record<string, SavedWarning[]>>({});
  // What the server holds per slot, as a token, so leaving a field unchanged sends nothing.
  const saved = useRef<Record<string, string>>({
    ...p.initial,
    ...Object.fromEntries(Object.entries(p.initialReasons).map(([slot, r]) => [slot, tokenOf("", r)])),
  });
  const inFlight = useRef(new Set<string>());
  const onRestore = useRef(p.onRestore);
  onRestore.current = p.onRestore;

  const updateQueue = useCallback(
    (fn: (q: Queue) => Queue) => {
      setQueue((q) => {
        const next = fn(q);
        try {
          const text = storedQueueText(next);
          if (text === null) localStorage.removeItem(storageKey);
          else localStorage.setItem(storageKey, text);
        } catch {
          // Private browsing can refuse storage; the on-screen queue still retries while the page is open.
        }
        return next;
      });
    },
    [storageKey],
  );

  const setSlotError = useCallback((slot: string, message: string | null) => {
    setErrors((e) => (message === null ? withoutKey(e, slot) : { ...e, [slot]: message }));
    if (message !== null) setStatus((s) => ({ ...s, [slot]: "error" }));
  }, []);

  const send = useCallback(
    async (item: Pending) => {
      const slot = slotOf(item.plotId, item.key);
      if (inFlight.current.has(slot)) return;
      inFlight.current.add(slot);
      setStatus((s) => ({ ...s, [slot]: "saving" }));
      try {
        const res = await fetch("/api/observations", {
          method: "POST",
          headers: { "Content-Type": "application/json" },
          body: JSON.stringify(saveRequestBody({ trialId, siteId, item })),
        });
        const body = (await res.json().catch(() => ({}))) as { error?: string; fieldErrors?: Record<string, string[]>; warnings?: SavedWarning[] };
        const outcome = saveOutcome({ status: res.status, ok: res.ok, slot, body: res.ok ? undefined : body });
        if (outcome.kind === "saved") {
          setWarnings((w) => ({ ...w, [slot]: warningsFor(body.warnings, item) }));
          saved.current[slot] = tokenOf(item.value, item.reason);
          setStatus((s) => ({ ...s, [slot]: "saved" }));
          setErrors((e) => withoutKey(e, slot));
          updateQueue((q) => afterSaved(q, item));
        } else if (outcome.kind === "refused") {
          setSlotError(slot, outcome.message);
          updateQueue((q) => withoutSlot(q, slot));
        } else {
          if (outcome.signedOut) setNotice("You have been signed out. Your unsaved values are kept on this device; sign in again in another tab and press Retry.");
          setStatus((s) => ({ ...s, [slot]: "queued" }));
        }
      } catch {
        setStatus((s) => ({ ...s, [slot]: "queued" }));
      } finally {
        inFlight.current.delete(slot);
      }
    },
    [trialId, siteId, updateQueue, setSlotError],
  );

  const retryAll = useCallback(() => {
    setQueue((q) => {
      for (const item of Object.values(q)) void send(item);
      return q;
    });
  }, [send]);

  // Values left unsaved on this device (page closed while offline) come back and are sent again.
  useEffect(() => {
    let stored: Queue = {};
    try {
      stored = readStoredQueue(localStorage.getItem(storageKey));
    } catch {
      stored = {};
    }
    if (Object.keys(stored).length > 0) {
      setQueue(stored);
      onRestore.current(stored);
      setStatus((s) => ({ ...s, ...Object.fromEntries(Object.keys(stored).map((k) => [k, "queued" as const])) }));
      for (const item of Object.values(stored)) void send(item);
    }
    const onOnline = () => retryAll();
    window.addEventListener("online", onOnline);
    const timer = setInterval(retryAll, RETRY_MS);
    return () => {
      window.removeEventListener("online", onOnline);
      clearInterval(timer);
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  /** Queues a value (replacing any older one for its slot) and tries to save it now. */
  const enqueue = useCallback(
    (item: Pending) => {
      updateQueue((q) => withQueued(q, item));
      void send(item);
    },
    [updateQueue, send],
  );

  /** Whether the slot would change: false when the server already holds this and nothing is queued for it. */
  const differs = useCallback((slot: string, token: string) => (saved.current[slot] ?? "") !== token || Boolean(queue[slot]), [queue]);

  return { queue, queuedCount: Object.keys(queue).length, status, errors, warnings, notice, enqueue, retryAll, differs, setSlotError };
}

function withoutKey<T>(record: Record<string, T>, key: string): Record<string, T> {
  if (!(key in record)) return record;
  const { [key]: _gone, ...rest } = record;
  return rest;
}
