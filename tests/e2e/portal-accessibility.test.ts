// Signed-in pages checked with axe-core in a real browser, as the public pages are in publish.test.ts,
// and the portal navigation tells which section the reader is in.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { seriousAccessibilityProblems } from "../helpers/axe";
import { baseUrl, launchBrowser, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function signedIn(email: string, password: string, viewport = { width: 1280, height: 900 }): Promise<Page> {
  const context = await browser.newContext({ baseURL: baseUrl, bypassCSP: true, viewport });
  const page = await context.newPage();
  await signIn(page, email, password);
  return page;
}

async function expectNoSeriousProblems(page: Page, pathname: string) {
  await page.goto(pathname);
  await page.waitForLoadState("networkidle");
  expect([pathname, await seriousAccessibilityProblems(page)]).toEqual([pathname, []]);
}

const currentSection = (page: Page) => page.getByRole("navigation", { name: "Portal" }).locator('[aria-current="page"]');

describe("portal pages for people using assistive technology", () => {
  it("has no serious or critical problems on the coordinator's pages, and marks the current section", async () => {
    const page = await signedIn(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto("/portal/trials");
    const trialPath = await page.getByRole("link", { name: "Baby-leaf kale in trays under lights" }).getAttribute("href");
    expect(trialPath).toMatch(/^\/portal\/trials\/\d+$/);
    for (const pathname of ["/portal", "/portal/trials", trialPath!, `${trialPath}/analysis`, "/portal/catalogue", "/portal/review", "/portal/sites", "/portal/seasons", "/portal/cooperators"]) {
      await expectNoSeriousProblems(page, pathname);
    }
    // A trial's own page still belongs to Trials; the home link is current only on the home page.
    await page.goto(trialPath!);
    expect(await currentSection(page).allTextContents()).toEqual(["Trials"]);
    await page.goto("/portal");
    expect(await currentSection(page).allTextContents()).toEqual(["Home"]);
    await page.context().close();
  }, 120_000);

  it("has no serious or critical problems on a grower's pages on a phone", async () => {
    const page = await signedIn(DEMO_SITES[0].grower.email, DEMO_PASSWORDS.cooperator, { width: 390, height: 844 });
    for (const pathname of ["/portal", "/portal/account", "/portal/record"]) await expectNoSeriousProblems(page, pathname);
    expect(await currentSection(page).allTextContents()).toEqual(["Record data"]);
    // the data-entry page itself, with a field per plot and trait, for the trial still taking values
    const entryPath = await page.locator('main a[href^="/portal/record/"]', { hasText: "Baby-leaf kale" }).first().getAttribute("href");
    expect(entryPath).toMatch(/^\/portal\/record\/\d+\/\d+/);
    await expectNoSeriousProblems(page, entryPath!);
    expect(await page.getByRole("button", { name: /^No value\?/ }).count()).toBeGreaterThan(0);
    await page.context().close();
  }, 60_000);

  it("lays the coordinator's tables out as cards on a phone, with nothing to scroll sideways", async () => {
    const page = await signedIn(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator, { width: 390, height: 844 });
    for (const pathname of ["/portal/trials", "/portal/catalogue", "/portal/sites"]) {
      await expectNoSeriousProblems(page, pathname);
      const overflowing = await page.evaluate(() =>
        [...document.querySelectorAll("table")].filter((t) => t.parentElement!.scrollWidth > t.parentElement!.clientWidth + 1).length,
      );
      expect([pathname, overflowing]).toEqual([pathname, 0]);
    }
    // Each cell names its column, and the table keeps its rows and cells for screen readers.
    await page.goto("/portal/catalogue");
    const crops = page.getByRole("table", { name: "Crops" });
    const kale = crops.getByRole("row").filter({ hasText: "Brassicas" });
    expect(await kale.getByRole("cell").first().getAttribute("data-label")).toBe("Crop");
    expect(await kale.getByRole("cell").first().textContent()).toBe("Kale");
    await page.context().close();
  }, 90_000);
});
