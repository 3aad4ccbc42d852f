import { isMissingReason, type MissingReason } from "@/lib/domain/observations/missing";

// The phone form's offline queue as plain functions over plain data, so its rules are tested without a
// browser; use-save-queue.ts wraps them in React state, the phone's IndexedDB (phone-store.ts) and fetch.

export type SlotStatus = "saving" | "saved" | "queued" | "error";

/** What a slot held on the server, as far as the phone knows. */
export interface KnownSaved {
  value: string | null;
  missingReason: MissingReason | null;
}

/** What the server holds now in a slot someone else changed, as the save route answers it. */
export interface ServerValue {
  saved: string;
  savedReason: MissingReason | null;
}

/** A value (or a reason for no value) waiting on the phone to reach the server, by slot `plotId:key`. */
export interface Pending {
  plotId: number;
  key: string;
  value: string;
  /** Why there is no value. */
  reason?: MissingReason | null;
  /** The phone's own id for this save: the server writes it once however often it is sent. */
  clientSaveId: string;
  /** When it was typed, in the order of typing on this phone: saves go out in this order. */
  seq: number;
  /** What the slot held on the server when the value was typed; a different value there now is someone else's. */
  knownSaved: KnownSaved;
  /** Set when the server holds someone else's newer value: the grower chooses, nothing is sent until then. */
  conflict?: ServerValue;
}

export type Queue = Record<string, Pending>;

export const slotOf = (plotId: number, key: string) => `${plotId}:${key}`;

// What a slot holds, value or reason, as one comparable string (a value can never start with a NUL).
export const tokenOf = (value: string, reason: MissingReason | null | undefined) => (reason ? `\u0000${reason}` : value);

/** The slot's token back as what the server holds. */
export function knownFromToken(token: string | undefined): KnownSaved {
  if (token?.startsWith("\u0000")) {
    const reason = token.slice(1);
    return { value: null, missingReason: isMissingReason(reason) ? reason : null };
  }
  return { value: token ? token : null, missingReason: null };
}

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

/**
 * The queue after `item` was saved: its slot leaves, unless a different value was typed while it was on its
 * way; that newer one now knows the server holds this phone's own value, so it is no conflict.
 */
export function afterSaved(queue: Queue, item: Pending): Queue {
  const slot = slotOf(item.plotId, item.key);
  const queued = queue[slot];
  if (!queued) return queue;
  if (queued.clientSaveId === item.clientSaveId || (!queued.conflict && tokenOf(queued.value, queued.reason) === tokenOf(item.value, item.reason))) return withoutSlot(queue, slot);
  return { ...queue, [slot]: { ...queued, knownSaved: { value: item.reason ? null : item.value || null, missingReason: item.reason ?? null } } };
}

/** The queue after the server answered that `item`'s slot holds someone else's newer value. */
export function afterConflict(queue: Queue, item: Pending, server: ServerValue): Queue {
  const slot = slotOf(item.plotId, item.key);
  const queued = queue[slot];
  if (!queued || queued.clientSaveId !== item.clientSaveId) return queue;
  return { ...queue, [slot]: { ...queued, conflict: server } };
}

/** Values to send, oldest typed first; those waiting for the grower's choice stay back. */
export function inSendingOrder(queue: Queue): Pending[] {
  return Object.values(queue)
    .filter((item) => !item.conflict)
    .sort((a, b) => a.seq - b.seq);
}

/** The JSON body that saves one item through POST /api/observations. */
export function saveRequestBody(p: { trialId: number; siteId: number; item: Pending }) {
  const { item } = p;
  return {
    trialId: p.trialId,
    siteId: p.siteId,
    clientSaveId: item.clientSaveId,
    values: [{ plotId: item.plotId, key: item.key, value: item.value === "" ? null : item.value, missingReason: item.reason ?? null, knownSaved: item.knownSaved }],
  };
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
  /** The server refused the value itself: retrying would not help, the grower needs to fix it (null: it gave no reason). */
  | { kind: "refused"; message: string | null }
  /** Someone else changed the slot since the phone last saw it: the grower chooses. */
  | { kind: "conflict"; server: ServerValue }
  /** No answer, a signed-out session or a server in trouble: keep the value and try again later. */
  | { kind: "retry"; signedOut: boolean };

const REFUSED = new Set([400, 403, 404, 409, 413, 415]);

export interface SaveErrorBody {
  error?: string;
  fieldErrors?: Record<string, string[]>;
  conflicts?: unknown;
}

/** What an answer from the save route means for one slot; `body` is the parsed error body, if any. */
export function saveOutcome(p: { status: number; ok: boolean; slot: string; body?: SaveErrorBody }): SaveOutcome {
  if (p.ok) return { kind: "saved" };
  if (p.status === 409 && Array.isArray(p.body?.conflicts)) {
    const mine = (p.body.conflicts as unknown[]).find((c): c is { plotId: number; key: string; saved: string; savedReason: unknown } => {
      if (typeof c !== "object" || c === null) return false;
      const x = c as Record<string, unknown>;
      return slotOf(Number(x.plotId), String(x.key)) === p.slot && typeof x.saved === "string";
    });
    if (mine) return { kind: "conflict", server: { saved: mine.saved, savedReason: isMissingReason(mine.savedReason) ? mine.savedReason : null } };
  }
  if (REFUSED.has(p.status)) return { kind: "refused", message: p.body?.fieldErrors?.[p.slot]?.join(" ") ?? p.body?.error ?? null };
  return { kind: "retry", signedOut: p.status === 401 };
}

function isKnownSaved(x: unknown): x is KnownSaved {
  if (typeof x !== "object" || x === null) return false;
  const k = x as Record<string, unknown>;
  return (k.value === null || typeof k.value === "string") && (k.missingReason === null || isMissingReason(k.missingReason));
}

function isPending(x: unknown): x is Pending {
  if (typeof x !== "object" || x === null) return false;
  const p = x as Record<string, unknown>;
  return (
    Number.isInteger(p.plotId) &&
    typeof p.key === "string" &&
    typeof p.value === "string" &&
    (p.reason === undefined || p.reason === null || isMissingReason(p.reason)) &&
    typeof p.clientSaveId === "string" &&
    typeof p.seq === "number" &&
    isKnownSaved(p.knownSaved)
  );
}

/** The queue kept on the phone by an earlier visit; anything unreadable is left out. */
export function readStoredQueue(stored: unknown): Queue {
  if (!stored || typeof stored !== "object" || Array.isArray(stored)) return {};
  const out: Queue = {};
  for (const item of Object.values(stored)) if (isPending(item)) out[slotOf(item.plotId, item.key)] = item;
  return out;
}

/**
 * Values an earlier version of the form left in localStorage (text keyed by slot, no ids), as queue items that
 * go after anything already waiting; what the server held is taken from the page. Anything unreadable is dropped.
 */
export function fromEarlierQueue(text: string | null, known: (slot: string) => KnownSaved, firstSeq: number, newId: () => string): Queue {
  let parsed: unknown;
  try {
    parsed = text ? JSON.parse(text) : null;
  } catch {
    return {};
  }
  if (!parsed || typeof parsed !== "object" || Array.isArray(parsed)) return {};
  const out: Queue = {};
  let seq = firstSeq;
  for (const x of Object.values(parsed)) {
    if (typeof x !== "object" || x === null) continue;
    const p = x as Record<string, unknown>;
    if (!Number.isInteger(p.plotId) || typeof p.key !== "string" || typeof p.value !== "string") continue;
    const reason = isMissingReason(p.reason) ? p.reason : null;
    const slot = slotOf(p.plotId as number, p.key);
    out[slot] = { plotId: p.plotId as number, key: p.key, value: p.value, reason, clientSaveId: newId(), seq: seq++, knownSaved: known(slot) };
  }
  return out;
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
