import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";

// Brightwater Flower Farm's kale: its grower sends the data, the coordinator returns it, and the grower's
// home says so first, with the coordinator's words, instead of thanking them.
const GROWER = "luis@brightwater.example";
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("a grower's home", () => {
  it("never says all is in while values are missing, and shows a return first, with the coordinator's message", async () => {
    const grower = await newPage(browser, { width: 390, height: 844 });
    await signIn(grower.page, GROWER, "seedplot-grower-demo");
    await grower.page.goto("/portal");
    const card = grower.page.locator("li", { has: grower.page.getByRole("link", { name: "Baby-leaf kale in trays under lights" }) }).first();
    await card.waitFor();
    const before = await card.textContent();
    expect(before).toMatch(/\d+ of \d+ values recorded/);
    expect(before).not.toMatch(/Thank you|everything the form asks for is in/i);
    expect(before).toMatch(/When it happens/);

    // The grower sends the data for review.
    await grower.page.goto("/portal/record");
    await grower.page.getByRole("link", { name: /Brightwater Flower Farm.*Baby-leaf kale/ }).click();
    await grower.page.getByRole("button", { name: "Send for review" }).first().click();
    await grower.page.getByText(/sent for review|Sent for review/).first().waitFor();
    const siteUrl = grower.page.url();

    // The coordinator returns it with a message.
    const staff = await newPage(browser);
    await signIn(staff.page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
    const [, trialId, siteId] = siteUrl.match(/\/portal\/record\/(\d+)\/(\d+)/)!;
    await staff.page.goto(`/portal/review/${trialId}/${siteId}`);
    await staff.page.getByLabel("Message to the grower (optional)").fill("Please add the quality scores for block 2.");
    await staff.page.getByRole("button", { name: "Return with comments" }).click();
    await staff.page.getByText(/returned/i).first().waitFor();

    await grower.page.goto("/portal");
    const returned = grower.page.locator("li", { has: grower.page.getByText("Returned for corrections") }).first();
    await returned.waitFor();
    expect(await returned.textContent()).toContain("Please add the quality scores for block 2.");
    // The return comes before any other site's list.
    const firstCard = await grower.page.locator("ul > li.rounded-lg").first().textContent();
    expect(firstCard).toContain("Returned for corrections");
    await grower.context.close();
    await staff.context.close();
  });
});
