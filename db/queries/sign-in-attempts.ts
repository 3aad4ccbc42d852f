import "server-only";
import { and, count, eq, gt } from "drizzle-orm";
import { db } from "../index";
import { signInAttempts } from "../schema";

/** Failed attempts for a throttle key (an account or an address) since the given time. */
export async function countRecentFailures(throttleKey: string, since: Date): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(signInAttempts)
    .where(and(eq(signInAttempts.throttleKey, throttleKey), eq(signInAttempts.succeeded, false), gt(signInAttempts.attemptedAt, since)));
  return row?.n ?? 0;
}
