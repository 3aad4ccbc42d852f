import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { addDays, todayIso } from "@/lib/domain/schedule";

const GROWER_PASSWORD = "seedplot-grower-demo";
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("date-order checks on the phone form", () => {
  it("a harvest date typed before the plot's emergence date shows a warning under both dates, and still saves", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await signIn(page, "hannah@larkspur.example", GROWER_PASSWORD);
    await page.goto("/portal/record");
    await page.getByRole("link", { name: /Larkspur Acres.*Baby-leaf kale/ }).click();
    await page.getByRole("heading", { name: /Larkspur Acres: Baby-leaf kale/ }).waitFor();

    // The demo sowed this site more than a week ago: both dates are after sowing and not in the future.
    const emergedOn = addDays(todayIso(), -1);
    const harvestedOn = addDays(todayIso(), -2);
    await page.getByLabel("What are you recording?").selectOption("all");
    const plot = page.locator("li[id^='plot-']").first();
    const emergence = plot.getByLabel("Emergence date");
    const harvest = plot.getByLabel("First harvest date");
    await emergence.fill(emergedOn);
    await emergence.press("Enter");
    const [emergenceId, harvestId] = [await emergence.getAttribute("id"), await harvest.getAttribute("id")];
    await expect.poll(() => page.locator(`#${emergenceId}-state`).textContent(), { timeout: 15_000 }).toBe("Saved");

    await harvest.fill(harvestedOn);
    // Shown from what is typed, before any answer from the server.
    const warning = /First harvest on .+ is before emergence on .+ in this plot — check both dates\./;
    const harvestCheck = page.locator(`#${harvestId}-check`);
    await expect.poll(() => harvestCheck.textContent(), { timeout: 5_000 }).toMatch(warning);
    expect(await page.locator(`#${emergenceId}-check`).textContent()).toMatch(warning);
    expect(await harvest.getAttribute("aria-describedby")).toContain(`${harvestId}-check`);

    // A warning does not block the save; the server adds what it alone knows (the packet's days to maturity).
    await harvest.press("Enter");
    await expect.poll(() => page.locator(`#${harvestId}-state`).textContent(), { timeout: 15_000 }).toBe("Saved");
    await expect.poll(() => harvestCheck.textContent(), { timeout: 5_000 }).toMatch(/days after sowing, much sooner than this entry is expected to be ready/);

    // Correcting the harvest date clears the order warning at once.
    await harvest.fill(emergedOn);
    await expect.poll(() => harvestCheck.textContent(), { timeout: 5_000 }).toMatch(/on the same day as emergence/);
    await harvest.fill("");
    await expect.poll(() => harvestCheck.count(), { timeout: 5_000 }).toBe(0);
    await context.close();
  });
});
