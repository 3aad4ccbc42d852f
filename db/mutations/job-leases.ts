import "server-only";
import { sql } from "drizzle-orm";
import type { ResultSetHeader } from "mysql2";
import { db } from "../index";

// Every time here is the database's (NOW(3)), so instances whose clocks disagree still agree on who holds a lease.

/**
 * Takes the named lease for `seconds` when nobody holds it (never taken, expired, or released). One UPDATE
 * decides, so of two instances asking at the same moment exactly one gets it. True when this holder has it.
 */
export async function takeLease(name: string, holder: string, seconds: number): Promise<boolean> {
  await db.execute(sql`INSERT IGNORE INTO job_leases (name, holder, expires_at) VALUES (${name}, '', TIMESTAMP('1970-01-02'))`);
  const [result] = (await db.execute(
    sql`UPDATE job_leases SET holder = ${holder}, expires_at = NOW(3) + INTERVAL ${Math.round(seconds * 1000)} * 1000 MICROSECOND WHERE name = ${name} AND expires_at <= NOW(3)`,
  )) as unknown as [ResultSetHeader];
  return result.affectedRows === 1;
}

/** Moves the end of a lease this holder has to `seconds` from now (after a finished run: the rest of its period). */
export async function extendLease(name: string, holder: string, seconds: number) {
  await db.execute(sql`UPDATE job_leases SET expires_at = NOW(3) + INTERVAL ${Math.round(seconds * 1000)} * 1000 MICROSECOND WHERE name = ${name} AND holder = ${holder}`);
}

/** Gives a lease up at once (a run stopped by shutdown), so another instance may take the job over. */
export async function releaseLease(name: string, holder: string) {
  await db.execute(sql`UPDATE job_leases SET expires_at = NOW(3) WHERE name = ${name} AND holder = ${holder}`);
}
