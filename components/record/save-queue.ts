import { isMissingReason, type MissingReason } from "@/lib/domain/observations/missing";

// The phone form's offline queue as plain functions over plain data, so its rules are tested without a
// browser; use-save-queue.ts wraps them in React state, localStorage and fetch.

export type SlotStatus = "saving" | "saved" | "queued" | "error";

/** A value (or a reason for no value) waiting to reach the server, by slot `plotId:key`. */
export interface Pending {
  plotId: number;
  key: string;
  value: string;
  /** Why there is no value; absent in items queued before reasons existed. */
  reason?: MissingReason | null;
}

export type Queue = Record<string, Pending>;

export const slotOf = (plotId: number, key: string) => `${plotId}:${key}`;

// What a slot holds, value or reason, as one comparable string (a value can never start with a NUL).
export const tokenOf = (value: string, reason: MissingReason | null | undefined) => (reason ? `\u0000${reason}` : value);

/** The queue with this item as its slot's latest value (a newer value replaces an older one). */
export function withQueued(queue: Queue, item: Pending): Queue {
  return { ...queue, [slotOf(item.plotId, item.key)]: item };
}

/** The queue without this slot. */
export function withoutSlot(queue: Queue, slot: string): Queue {
  if (!(slot in queue)) return queue;
  const { [slot]: _gone, ...rest } = queue;
  return rest;
}

/** The queue after `item` was saved: its slot leaves, unless a newer value was typed while it was in flight. */
export function afterSaved(queue: Queue, item: Pending): Queue {
  const slot = slotOf(item.plotId, item.key);
  const queued = queue[slot];
  if (!queued || tokenOf(queued.value, queued.reason) !== tokenOf(item.value, item.reason)) return queue;
  return withoutSlot(queue, slot);
}

/** The JSON body that saves one item through POST /api/observations. */
export function saveRequestBody(p: { trialId: number; siteId: number; item: Pending }) {
  const { item } = p;
  return { trialId: p.trialId, siteId: p.siteId, values: [{ plotId: item.plotId, key: item.key, value: item.value === "" ? null : item.value, missingReason: item.reason ?? null }] };
}

/** A value that saved but is worth a second look, as the save route answers it. */
export interface SavedWarning {
  plotId: number;
  key: string;
  kind: string;
  message: string;
}

/** The warnings of a save answer that belong to the item just saved (anything unreadable is dropped). */
export function warningsFor(warnings: unknown, item: Pick<Pending, "plotId" | "key">): SavedWarning[] {
  if (!Array.isArray(warnings)) return [];
  return warnings.filter(
    (w): w is SavedWarning => typeof w === "object" && w !== null && w.plotId === item.plotId && w.key === item.key && typeof w.kind === "string" && typeof w.message === "string",
  );
}

export type SaveOutcome =
  | { kind: "saved" }
  /** The server refused the value itself: retrying would not help, the grower needs to fix it. */
  | { kind: "refused"; message: string }
  /** No answer, a signed-out session or a server in trouble: keep the value and try again later. */
  | { kind: "retry"; signedOut: boolean };

const REFUSED = new Set([400, 403, 404, 409, 413, 415]);

/** What an answer from the save route means for one slot; `body` is the parsed error body, if any. */
export function saveOutcome(p: { status: number; ok: boolean; slot: string; body?: { error?: string; fieldErrors?: Record<string, string[]> } }): SaveOutcome {
  if (p.ok) return { kind: "saved" };
  if (REFUSED.has(p.status)) return { kind: "refused", message: p.body?.fieldErrors?.[p.slot]?.join(" ") ?? p.body?.error ?? "This value was not accepted." };
  return { kind: "retry", signedOut: p.status === 401 };
}

/** What to keep in the device's storage: null means remove the entry. */
export function storedQueueText(queue: Queue): string | null {
  return Object.keys(queue).length === 0 ? null : JSON.stringify(queue);
}

/** The queue left in the device's storage by an earlier visit; anything unreadable counts as empty. */
export function readStoredQueue(text: string | null): Queue {
  if (!text) return {};
  try {
    const parsed: unknown = JSON.parse(text);
    if (!parsed || typeof parsed !== "object" || Array.isArray(parsed)) return {};
    return parsed as Queue;
  } catch {
    return {};
  }
}

/** Field values after restoring a stored queue: each queued slot shows the value that was waiting. */
export function restoredInputs(inputs: Record<string, string>, stored: Queue): Record<string, string> {
  return { ...inputs, ...Object.fromEntries(Object.entries(stored).map(([slot, item]) => [slot, item.value])) };
}

/** Reasons after restoring a stored queue: a queued reason is shown, a queued value clears the slot's reason. */
export function restoredReasons(reasons: Record<string, MissingReason>, stored: Queue): Record<string, MissingReason> {
  const next = { ...reasons };
  for (const [slot, item] of Object.entries(stored)) {
    if (isMissingReason(item.reason)) next[slot] = item.reason;
    else delete next[slot];
  }
  return next;
}
