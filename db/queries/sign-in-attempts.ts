import "server-only";
import { sql } from "drizzle-orm";
import { db } from "../index";

/**
 * Failed attempts for a throttle key (an account or an address) since the given time that came after
 * the key's last success, so a successful sign-in forgives earlier typos without deleting rows (which
 * made concurrent sign-ins deadlock).
 */
export async function countRecentFailures(throttleKey: string, since: Date, forgivenBySuccess = true): Promise<number> {
  const forgiven = forgivenBySuccess
    ? sql`AND NOT EXISTS (
        SELECT 1 FROM sign_in_attempts s
        WHERE s.throttle_key = f.throttle_key AND s.succeeded = 1 AND s.attempted_at >= f.attempted_at)`
    : sql``;
  const [rows] = (await db.execute(sql`
    SELECT COUNT(*) AS n FROM sign_in_attempts f
    WHERE f.throttle_key = ${throttleKey} AND f.succeeded = 0 AND f.attempted_at > ${since} ${forgiven}`)) as unknown as [{ n: number }[]];
  return Number(rows[0]?.n ?? 0);
}
