import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";

// Brightwater Flower Farm's kale plots have no quality scores in the demo, so these tests own that column.
const GROWER = "luis@brightwater.example";
const GROWER_PASSWORD = "seedplot-grower-demo";
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function openQuality(page: Page) {
  await page.goto("/portal/record");
  await page.getByRole("link", { name: /Brightwater Flower Farm.*Baby-leaf kale/ }).click();
  await page.getByRole("heading", { name: /Brightwater Flower Farm: Baby-leaf kale/ }).waitFor();
  await page.getByLabel("What are you recording?").selectOption({ label: "Overall quality (1-9)" });
}

describe("recording on a phone", () => {
  it("a message about a wrong value goes as soon as the value is valid again, even when it is the saved value", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await signIn(page, GROWER, GROWER_PASSWORD);
    await openQuality(page);
    const input = page.locator("li[id^='plot-']").nth(0).getByRole("textbox");
    const id = await input.getAttribute("id");
    const state = page.locator(`#${id}-state`);
    await input.fill("6");
    await input.press("Enter");
    await expect.poll(() => state.textContent(), { timeout: 15_000 }).toBe("Saved");
    await input.fill("10");
    await input.blur();
    await expect.poll(() => state.textContent(), { timeout: 5_000 }).toMatch(/1 to 9|1–9|between/i);
    // Typing back the saved value: the message goes while typing, before the field is left.
    await input.fill("6");
    await expect.poll(() => state.textContent(), { timeout: 5_000 }).not.toMatch(/1 to 9|1–9|between/i);
    await input.blur();
    expect(await state.textContent()).not.toMatch(/1 to 9|1–9|between/i);
    await context.close();
  });

  it("fills one value into every empty plot of a column after a confirmation naming how many, leaving filled plots alone", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await signIn(page, GROWER, GROWER_PASSWORD);
    await openQuality(page);
    const plots = page.locator("li[id^='plot-']");
    const total = await plots.count();
    const first = plots.nth(0).getByRole("textbox");
    const kept = await first.inputValue();
    expect(kept).toBe("6");
    await page.getByRole("button", { name: `Same value for the ${total - 1} empty plots…` }).click();
    const dialog = page.getByRole("dialog");
    await dialog.getByText(`This writes the value into the ${total - 1} plots`).waitFor();
    await dialog.getByLabel(/^Value/).fill("12");
    await dialog.getByRole("button", { name: `Fill ${total - 1} plots` }).click();
    await expect.poll(() => page.locator("#fill-error").textContent(), { timeout: 5_000 }).toMatch(/1 to 9|1–9|between/i);
    await dialog.getByLabel(/^Value/).fill("7");
    await dialog.getByRole("button", { name: `Fill ${total - 1} plots` }).click();
    await expect.poll(() => page.getByRole("dialog").count(), { timeout: 5_000 }).toBe(0);
    const lastId = await plots.nth(total - 1).getByRole("textbox").getAttribute("id");
    await expect.poll(() => page.locator(`#${lastId}-state`).textContent(), { timeout: 20_000 }).toBe("Saved");

    // After a reload the values come from the server: the filled plots hold 7, the first keeps its 6.
    await openQuality(page);
    expect(await plots.nth(0).getByRole("textbox").inputValue()).toBe("6");
    for (let i = 1; i < total; i++) expect(await plots.nth(i).getByRole("textbox").inputValue()).toBe("7");
    expect(await page.getByRole("button", { name: /Same value for the/ }).count()).toBe(0);
    // Send for review is offered after the last plot too, so a long list need not be scrolled back up.
    expect(await page.getByRole("button", { name: "Send for review" }).count()).toBe(2);
    await context.close();
  });
});
