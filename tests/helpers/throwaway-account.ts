import type { createDatabase } from "@/db/client";
import { hashPassword } from "@/server/auth/password";

/** A fresh grower account with a known password, unique per call, for tests that sign in, out and reset. */
export async function insertThrowawayGrower(database: ReturnType<typeof createDatabase>, tag: string, name: string) {
  const email = `${tag}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}@example.org`;
  const password = `first-password-${tag}`;
  await database.pool.query("INSERT INTO users (email, name, role, password_hash, active) VALUES (?, ?, 'cooperator', ?, 1)", [email, name, await hashPassword(password)]);
  return { email, password };
}
