import "server-only";
import { and, eq, lt } from "drizzle-orm";
import { db } from "../index";
import { signInAttempts } from "../schema";

/** Records an attempt under each throttle key; a success clears that account's earlier failures. */
export async function insertSignInAttempt(keys: string[], succeeded: boolean) {
  await db.transaction(async (tx) => {
    if (succeeded) {
      for (const key of keys) {
        await tx.delete(signInAttempts).where(and(eq(signInAttempts.throttleKey, key), eq(signInAttempts.succeeded, false)));
      }
    }
    await tx.insert(signInAttempts).values(keys.map((throttleKey) => ({ throttleKey, succeeded })));
    // Old rows are no longer needed for throttling.
    await tx.delete(signInAttempts).where(lt(signInAttempts.attemptedAt, new Date(Date.now() - 24 * 3600_000)));
  });
}
