import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { unique } from "../helpers/db";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the next season in the browser", () => {
  it("a coordinator plans next season from last season's lettuce trial and takes it through to randomised sites", { timeout: 90_000 }, async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
    await page.goto("/portal/trials");
    await page.getByRole("link", { name: /Leaf lettuce for spring markets/ }).first().click();
    await page.getByRole("heading", { name: "Plan next season from this trial" }).waitFor();
    const entriesBefore = await page.getByRole("cell", { name: /^[A-Z0-9]{3}$/ }).count();
    const code = unique("NX").toUpperCase().replace(/[^A-Z0-9-]/g, "").slice(0, 30);
    await page.getByLabel("Season").last().selectOption({ label: "Winter 2026–27" });
    await page.getByLabel("New trial code").fill(code);
    await page.getByLabel("Title").last().fill("Leaf lettuce, second year");
    const source = page.url();
    await page.getByRole("button", { name: "Plan next season from this trial" }).click();
    await page.waitForURL((url) => /\/portal\/trials\/\d+$/.test(url.pathname) && url.href !== source, { timeout: 30_000 });
    await page.getByRole("heading", { name: "Leaf lettuce, second year" }).waitFor();
    expect(await page.getByText(/^Planned from /).textContent()).toContain("TV26-LET");
    expect(await page.getByText(code).first().isVisible()).toBe(true);
    // The same entries and six sites, none laid out yet, nothing sown.
    await expect.poll(() => page.getByRole("cell", { name: /^[A-Z0-9]{3}$/ }).count(), { timeout: 20_000 }).toBe(entriesBefore);
    await expect.poll(() => page.getByText("Not laid out yet").count(), { timeout: 20_000 }).toBe(6);

    for (let i = 0; i < 2; i += 1) {
      await page.getByRole("button", { name: /^Randomise/ }).first().click();
      await expect.poll(() => page.getByRole("link", { name: "Layout and printables" }).count(), { timeout: 20_000 }).toBe(i + 1);
    }
    await context.close();
  });
});
