import "server-only";
import { sql } from "drizzle-orm";
import { db } from "../index";

/** One round trip to MariaDB; throws when it cannot be reached. */
export async function pingDatabase() {
  await db.execute(sql`SELECT 1`);
}
