import "server-only";
import { env } from "@/lib/env";
import { createDatabase, type Database } from "./client";

// Reused across dev hot reloads so MariaDB does not run out of connections.
const globalForDb = globalThis as unknown as { seedplotDb?: ReturnType<typeof createDatabase> };
const instance = globalForDb.seedplotDb ?? createDatabase(env.DATABASE_URL, env.DB_POOL_SIZE);
if (env.NODE_ENV !== "production") globalForDb.seedplotDb = instance;

export const db: Database = instance.db;
export const pool = instance.pool;
export type { Database };
export type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];
