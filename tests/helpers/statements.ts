import { vi } from "vitest";

/** A statement the app's pool was sent, with its values. */
export interface SentStatement {
  sql: string;
  params: unknown[];
}

/** The statements `pool` (the app's own, from @/db/index) is sent while `run` runs. */
export async function statementsDuring(pool: { query: (...args: never[]) => unknown }, run: () => Promise<unknown>): Promise<SentStatement[]> {
  const sent: SentStatement[] = [];
  const original = pool.query.bind(pool) as (...args: unknown[]) => unknown;
  const spy = vi.spyOn(pool, "query").mockImplementation(((...args: unknown[]) => {
    const [query, params] = args as [string | { sql: string }, unknown[] | undefined];
    sent.push({ sql: typeof query === "string" ? query : query.sql, params: params ?? [] });
    return original(...args);
  }) as never);
  try {
    await run();
  } finally {
    spy.mockRestore();
  }
  return sent;
}
