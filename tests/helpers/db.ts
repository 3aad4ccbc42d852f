import { createDatabase } from "@/db/client";

/** A Drizzle client on the integration-test database (never the demo database). */
export function testDatabase() {
  const url = process.env.TEST_DATABASE_URL ?? process.env.DATABASE_URL;
  if (!url || !/seedplot_test/.test(url)) throw new Error("Integration tests need TEST_DATABASE_URL pointing at the seedplot_test database (run scripts/test.sh).");
  return createDatabase(url, 4);
}

/** A unique suffix so parallel test files never collide on unique keys. */
export const unique = (prefix: string) => `${prefix}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 7)}`;
