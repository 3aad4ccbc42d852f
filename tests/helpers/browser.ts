import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";

/** Base URL of the server the browser tests run against (set by scripts/test.sh). */
export const baseUrl = process.env.E2E_BASE_URL ?? "http://localhost:3000";

// Flags for Debian's chromium in a sandboxed CI machine with no outside network.
export const FLAGS = [
  "--headless=new",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
];

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium", args: FLAGS, headless: true });
}

export async function newPage(browser: Browser, viewport = { width: 1280, height: 900 }): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ baseURL: baseUrl, viewport });
  const page = await context.newPage();
  return { context, page };
}

/** Signs in through the real form and waits for the portal home. */
export async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL("**/portal", { timeout: 20_000 });
}
