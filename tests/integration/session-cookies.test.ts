import { afterAll, describe, expect, it } from "vitest";
import { createRequire } from "node:module";
import path from "node:path";
import { authOptions } from "@/server/auth/config";
import { pool } from "@/db/index";

// next-auth's request core is not in its package exports; loading the file by path runs the same code the route runs.
interface CookieOut {
  name: string;
  options: { secure?: boolean; httpOnly?: boolean; sameSite?: string | boolean };
}
const { AuthHandler } = createRequire(import.meta.url)(path.resolve(import.meta.dirname, "../../node_modules/next-auth/core/index.js")) as {
  AuthHandler: (params: { req: Request; options: typeof authOptions }) => Promise<{ cookies?: CookieOut[] }>;
};

afterAll(async () => {
  await pool.end();
});

async function cookiesFor(origin: string) {
  const previous = process.env.NEXTAUTH_URL;
  process.env.NEXTAUTH_URL = origin;
  try {
    const response = await AuthHandler({ req: new Request(`${origin}/api/auth/csrf`), options: authOptions });
    return response.cookies ?? [];
  } finally {
    if (previous === undefined) delete process.env.NEXTAUTH_URL;
    else process.env.NEXTAUTH_URL = previous;
  }
}

describe("session cookie flags", () => {
  it("marks auth cookies Secure with a __Host-/__Secure- name when the site runs on https, and never readable by scripts", async () => {
    const cookies = await cookiesFor("https://seedplot.example.org");
    expect(cookies.length).toBeGreaterThan(0);
    for (const c of cookies) {
      expect([c.name, c.options.secure]).toEqual([c.name, true]);
      expect(c.name).toMatch(/^__(Host|Secure)-/);
      expect(c.options.sameSite).toBe("lax");
    }
    expect(cookies.find((c) => c.name.endsWith("csrf-token"))?.options.httpOnly).toBe(true);
  });

  it("leaves Secure off on plain http, so the loopback test server can keep a session", async () => {
    const cookies = await cookiesFor("http://localhost:3100");
    expect(cookies.length).toBeGreaterThan(0);
    for (const c of cookies) expect([c.name, c.options.secure]).toEqual([c.name, false]);
  });
});
