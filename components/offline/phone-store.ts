import { clear, createStore, del, entries, get, set, type UseStore } from "idb-keyval";
import { PERSONAL_CACHES, PHONE_DB, PHONE_OWNER_KEY, PHONE_STORE } from "@/lib/domain/offline";

// What this phone keeps for the person signed in: values typed and not yet saved (IndexedDB through
// idb-keyval, which outlives a reload, a closed tab and a restart) and, through the service worker, their
// recording pages (lib/domain/offline.ts). Everything here is emptied at sign-out.

let store: UseStore | null = null;
const phoneStore = () => (store ??= createStore(PHONE_DB, PHONE_STORE));
const hasIndexedDb = () => typeof indexedDB !== "undefined";

/** The queue kept under this key, as stored (read it with readStoredQueue). */
export async function readPhoneQueue(key: string): Promise<unknown> {
  return hasIndexedDb() ? get(key, phoneStore()) : undefined;
}

/** Keeps a queue under this key; an empty one removes the key. */
export async function writePhoneQueue(key: string, queue: Record<string, unknown>): Promise<void> {
  if (!hasIndexedDb()) return;
  if (Object.keys(queue).length === 0) await del(key, phoneStore());
  else await set(key, queue, phoneStore());
}

/** How many values wait on this phone for this person, over all their sites. */
export async function countWaitingOnPhone(userId: number): Promise<number> {
  if (!hasIndexedDb()) return 0;
  const all = await entries<string, unknown>(phoneStore());
  return all.filter(([key]) => key.startsWith(`${userId}:`)).reduce((n, [, queue]) => n + (queue && typeof queue === "object" ? Object.keys(queue).length : 0), 0);
}

async function clearPersonalCaches() {
  if (typeof caches === "undefined") return;
  await Promise.all(PERSONAL_CACHES.map((name) => caches.delete(name)));
}

/** Signing out: the values waiting on the phone and the kept pages go. The build's scripts, the same for everyone, stay. */
export async function clearPhone(): Promise<void> {
  await Promise.all([hasIndexedDb() ? clear(phoneStore()) : undefined, clearPersonalCaches()]);
}

/**
 * Called on every signed-in page: if someone else used this phone last (and did not sign out), their kept
 * pages go before this person can see them offline. Their unsent values stay under their own id.
 */
export function claimPhoneFor(userId: number): Promise<void> {
  // Once per page load and person, so pages asking to keep sites ready wait for the same claim.
  return (claims[userId] ??= claim(userId).catch(() => undefined));
}

const claims: Record<number, Promise<void>> = {};

async function claim(userId: number): Promise<void> {
  if (!hasIndexedDb()) return;
  const owner = await get<number>(PHONE_OWNER_KEY, phoneStore());
  if (owner === userId) return;
  await clearPersonalCaches();
  await set(PHONE_OWNER_KEY, userId, phoneStore());
}
