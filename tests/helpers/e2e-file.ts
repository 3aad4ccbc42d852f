import { afterAll, beforeAll } from "vitest";
import type { Browser } from "playwright-core";
import { createDatabase } from "@/db/client";
import { launchBrowser, newPage } from "./browser";

/**
 * For a browser test file: a pool on the e2e server's database and one browser, opened before the file's
 * tests and closed after them. `openPage` opens a fresh context (no cookies) in that browser.
 */
export function e2eBrowserAndDatabase() {
  const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
  let browser: Browser | null = null;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await e2e.pool.end();
  });
  return { e2e, openPage: (viewport?: { width: number; height: number }) => newPage(browser!, viewport) };
}
