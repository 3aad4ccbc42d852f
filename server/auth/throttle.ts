import "server-only";
import { countRecentFailures } from "@/db/queries/sign-in-attempts";
import { insertSignInAttempt } from "@/db/mutations/sign-in-attempts";

export const THROTTLE_WINDOW_MINUTES = 15;
// Per account: a person mistyping a few times is fine; a guesser is slowed to 5 tries per 15 minutes.
export const MAX_FAILURES_PER_ACCOUNT = 5;
// Per address: a shared farm office may hold several people, so the address limit is higher.
export const MAX_FAILURES_PER_ADDRESS = 20;

export const accountKey = (email: string) => `account:${email.toLowerCase()}`;
export const addressKey = (address: string) => `address:${address}`;

/** True when either the account or the address has used up its failed attempts in the window. */
export async function isThrottled(email: string, address: string): Promise<boolean> {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MINUTES * 60_000);
  const [byAccount, byAddress] = await Promise.all([
    countRecentFailures(accountKey(email), since),
    // One valid account must not reset the limit for everyone behind the same address.
    countRecentFailures(addressKey(address), since, false),
  ]);
  return byAccount >= MAX_FAILURES_PER_ACCOUNT || byAddress >= MAX_FAILURES_PER_ADDRESS;
}

export async function recordAttempt(email: string, address: string, succeeded: boolean) {
  await insertSignInAttempt([accountKey(email), addressKey(address)], succeeded);
}

/**
 * Counts one use of a rate-limited action under each key and refuses (returns false) once any key has
 * reached its limit within the window. Used for invitations and password-reset mails, so nobody can
 * flood an inbox through Seedplot.
 */
export async function consumeRateLimit(limits: { key: string; max: number }[], windowMinutes: number): Promise<boolean> {
  const since = new Date(Date.now() - windowMinutes * 60_000);
  const counts = await Promise.all(limits.map((l) => countRecentFailures(`rate:${l.key}`, since)));
  if (counts.some((n, i) => n >= limits[i]!.max)) return false;
  // Stored as "failed" attempts so the same counting query serves both throttles.
  await insertSignInAttempt(limits.map((l) => `rate:${l.key}`), false);
  return true;
}
