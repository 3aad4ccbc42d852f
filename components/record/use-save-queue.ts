"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import { useTranslations } from "next-intl";
import type { MissingReason } from "@/lib/domain/observations/missing";
import { phoneQueueKey } from "@/lib/domain/offline";
import { readPhoneQueue, writePhoneQueue } from "@/components/offline/phone-store";
import {
  afterConflict,
  afterSaved,
  fromEarlierQueue,
  inSendingOrder,
  knownFromToken,
  readStoredQueue,
  saveOutcome,
  saveRequestBody,
  slotOf,
  tokenOf,
  warningsFor,
  withoutSlot,
  withQueued,
  type Pending,
  type Queue,
  type SaveErrorBody,
  type SavedWarning,
  type SlotStatus,
} from "./save-queue";

const RETRY_MS = 20_000;

/** A value to queue: what the grower typed or chose in one slot. */
export type Typed = Pick<Pending, "plotId" | "key" | "value" | "reason">;

/**
 * Saves each value on its own. Every value is first kept on the phone (IndexedDB, per person and site), so a
 * reload, a closed tab or a restart loses nothing; then values are sent one at a time in the order they were
 * typed (every 20 s, when the browser comes back online, on the next visit, or on "Send now"), each with
 * its own id so the server writes it once however often it arrives. A value someone else changed meanwhile
 * waits for the grower's choice (`choose`). `onRestore` gets the values left on the phone by an earlier visit.
 */
export function useSaveQueue(p: { userId: number; trialId: number; siteId: number; initial: Record<string, string>; initialReasons: Record<string, MissingReason>; onRestore: (stored: Queue) => void }) {
  const { trialId, siteId } = p;
  const t = useTranslations("offline");
  const storageKey = phoneQueueKey(p.userId, trialId, siteId);
  const [queue, setQueue] = useState<Queue>({});
  const queueRef = useRef<Queue>({});
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
  const [savedTokens, setSavedTokens] = useState<Record<string, string>>(saved.current);
  const sending = useRef(false);
  const restored = useRef(false);
  const onRestore = useRef(p.onRestore);
  onRestore.current = p.onRestore;
  const seq = useRef(0);

  // The phone's copy is written on every change; IndexedDB runs writes to one store in the order they start.
  const updateQueue = useCallback(
    (fn: (q: Queue) => Queue) => {
      const next = fn(queueRef.current);
      if (next === queueRef.current) return;
      queueRef.current = next;
      setQueue(next);
      writePhoneQueue(storageKey, next).catch(() => {
        // Private browsing can refuse storage; the on-screen queue still sends while the page is open.
      });
    },
    [storageKey],
  );

  const setSlotError = useCallback((slot: string, message: string | null) => {
    setErrors((e) => (message === null ? withoutKey(e, slot) : { ...e, [slot]: message }));
    if (message !== null) setStatus((s) => ({ ...s, [slot]: "error" }));
  }, []);

  const markSaved = useCallback((slot: string, token: string) => {
    saved.current[slot] = token;
    setSavedTokens((t) => ({ ...t, [slot]: token }));
  }, []);

  /** Sends one item; true when the next one may go (false: no connection, keep the order and stop). */
  const send = useCallback(
    async (item: Pending): Promise<boolean> => {
      const slot = slotOf(item.plotId, item.key);
      setStatus((s) => ({ ...s, [slot]: "saving" }));
      try {
        const res = await fetch("/api/observations", {
          method: "POST",
          headers: { "Content-Type": "application/json" },
          body: JSON.stringify(saveRequestBody({ trialId, siteId, item })),
        });
        const body = (await res.json().catch(() => ({}))) as SaveErrorBody & { warnings?: SavedWarning[] };
        const outcome = saveOutcome({ status: res.status, ok: res.ok, slot, body: res.ok ? undefined : body });
        if (outcome.kind === "saved") {
          setWarnings((w) => ({ ...w, [slot]: warningsFor(body.warnings, item) }));
          markSaved(slot, tokenOf(item.value, item.reason));
          setStatus((s) => ({ ...s, [slot]: "saved" }));
          setErrors((e) => withoutKey(e, slot));
          setNotice(null);
          updateQueue((q) => afterSaved(q, item));
          return true;
        }
        if (outcome.kind === "conflict") {
          setStatus((s) => ({ ...s, [slot]: "queued" }));
          updateQueue((q) => afterConflict(q, item, outcome.server));
          return true;
        }
        if (outcome.kind === "refused") {
          setSlotError(slot, outcome.message ?? t("notAccepted"));
          updateQueue((q) => (q[slot]?.clientSaveId === item.clientSaveId ? withoutSlot(q, slot) : q));
          return true;
        }
        if (outcome.signedOut) setNotice(t("signedOut"));
        setStatus((s) => ({ ...s, [slot]: "queued" }));
        return false;
      } catch {
        setStatus((s) => ({ ...s, [slot]: "queued" }));
        return false;
      }
    },
    [trialId, siteId, updateQueue, setSlotError, markSaved, t],
  );

  /** Sends what waits, oldest first, one at a time; stops at the first that finds no connection. */
  const sendWaiting = useCallback(async () => {
    if (sending.current || !restored.current) return;
    sending.current = true;
    try {
      for (;;) {
        const next = inSendingOrder(queueRef.current)[0];
        if (!next) break;
        if (!(await send(next))) break;
        // A value typed again while this one was on its way is sent next, in its turn.
      }
    } finally {
      sending.current = false;
    }
  }, [send]);

  // Values left on the phone by an earlier visit (page closed offline, phone restarted) come back and go out.
  useEffect(() => {
    let cancelled = false;
    void (async () => {
      let stored: Queue = {};
      try {
        stored = readStoredQueue(await readPhoneQueue(storageKey));
      } catch {
        stored = {};
      }
      if (cancelled) return;
      // Values an earlier version of this form kept in localStorage move to the phone's store.
      const earlierKey = `seedplot:unsaved:${trialId}:${siteId}`;
      try {
        const earlier = fromEarlierQueue(localStorage.getItem(earlierKey), (slot) => knownFromToken(saved.current[slot]), Date.now(), () => crypto.randomUUID());
        stored = { ...earlier, ...stored };
        if (Object.keys(earlier).length > 0) await writePhoneQueue(storageKey, stored);
        localStorage.removeItem(earlierKey);
      } catch {
        // Storage refused: nothing to move.
      }
      if (cancelled) return;
      // Anything typed before the phone's copy was read goes after what was already waiting.
      const typedMeanwhile = queueRef.current;
      const merged = { ...stored, ...typedMeanwhile };
      seq.current = Math.max(Date.now(), ...Object.values(merged).map((i) => i.seq + 1));
      if (Object.keys(stored).length > 0) {
        queueRef.current = merged;
        setQueue(merged);
        onRestore.current(stored);
        setStatus((s) => ({ ...s, ...Object.fromEntries(Object.keys(stored).map((k) => [k, "queued" as const])) }));
      }
      restored.current = true;
      void sendWaiting();
    })();
    const onOnline = () => void sendWaiting();
    window.addEventListener("online", onOnline);
    const timer = setInterval(onOnline, RETRY_MS);
    return () => {
      cancelled = true;
      window.removeEventListener("online", onOnline);
      clearInterval(timer);
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  /** Keeps a value on the phone (replacing any older one for its slot) and sends what waits. */
  const enqueue = useCallback(
    (typed: Typed) => {
      const slot = slotOf(typed.plotId, typed.key);
      // Leaving a field after Enter commits the same value again: the one already waiting stands.
      const waiting = queueRef.current[slot];
      if (waiting && !waiting.conflict && tokenOf(waiting.value, waiting.reason) === tokenOf(typed.value, typed.reason)) {
        void sendWaiting();
        return;
      }
      const item: Pending = { ...typed, clientSaveId: crypto.randomUUID(), seq: (seq.current = Math.max(seq.current + 1, Date.now())), knownSaved: knownFromToken(saved.current[slot]) };
      updateQueue((q) => withQueued(q, item));
      setStatus((s) => ({ ...s, [slot]: "queued" }));
      void sendWaiting();
    },
    [updateQueue, sendWaiting],
  );

  /**
   * The grower's answer to a value someone else changed: keep theirs (the field shows it, nothing is sent)
   * or send their own, now knowing what it replaces. Returns the value the field should show.
   */
  const choose = useCallback(
    (slot: string, keep: "theirs" | "mine") => {
      const item = queueRef.current[slot];
      if (!item?.conflict) return;
      const server = item.conflict;
      markSaved(slot, tokenOf(server.saved, server.savedReason));
      if (keep === "theirs") {
        updateQueue((q) => withoutSlot(q, slot));
        setStatus((s) => ({ ...s, [slot]: "saved" }));
        return;
      }
      const again: Pending = { ...item, conflict: undefined, clientSaveId: crypto.randomUUID(), seq: (seq.current = Math.max(seq.current + 1, Date.now())), knownSaved: { value: server.savedReason ? null : server.saved || null, missingReason: server.savedReason } };
      updateQueue((q) => withQueued(q, again));
      void sendWaiting();
    },
    [markSaved, updateQueue, sendWaiting],
  );

  /** Whether the slot would change: false when the server already holds this and nothing waits for it. */
  const differs = useCallback((slot: string, token: string) => (saved.current[slot] ?? "") !== token || Boolean(queue[slot]), [queue]);

  const waiting = Object.values(queue);
  return {
    queue,
    queuedCount: waiting.length,
    conflictCount: waiting.filter((i) => i.conflict).length,
    savedTokens,
    status,
    errors,
    warnings,
    notice,
    enqueue,
    choose,
    retryAll: sendWaiting,
    differs,
    setSlotError,
  };
}

function withoutKey<T>(record: Record<string, T>, key: string): Record<string, T> {
  if (!(key in record)) return record;
  const { [key]: _gone, ...rest } = record;
  return rest;
}
