import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "./schema";

export type Database = MySql2Database<typeof schema>;

/** Creates a pool and a Drizzle client; used by db/index.ts and by scripts that run outside Next. */
export function createDatabase(url: string, connectionLimit: number) {
  const pool = mysql.createPool({
    uri: url,
    connectionLimit,
    waitForConnections: true,
    enableKeepAlive: true,
    // A MariaDB that accepts the socket but never answers should fail a request in seconds, not hang it.
    connectTimeout: 5000,
    // Dates come back as strings for DATE columns and as JS Dates (UTC) for timestamps.
    timezone: "Z",
    dateStrings: ["DATE"],
    decimalNumbers: true,
    // No stack captured for every query: it was a twentieth of a save's work, and a failed query still tells its
    // caller, through Drizzle's error (the SQL and its cause) and Node's async stack trace.
    trace: false,
  });
  const db = drizzle(pool, { schema, mode: "default" });
  return { pool, db };
}
