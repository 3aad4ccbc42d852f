import "server-only";
import { lt } from "drizzle-orm";
import { db } from "../index";
import { signInAttempts } from "../schema";

/** Records an attempt under each throttle key (one insert; no locks held across statements). */
export async function insertSignInAttempt(keys: string[], succeeded: boolean) {
  await db.insert(signInAttempts).values(keys.map((throttleKey) => ({ throttleKey, succeeded })));
}

/** Drops attempts older than a day; they no longer count for any limit. Run by the background job. */
export async function deleteOldSignInAttempts() {
  await db.delete(signInAttempts).where(lt(signInAttempts.attemptedAt, new Date(Date.now() - 24 * 3600_000)));
}
