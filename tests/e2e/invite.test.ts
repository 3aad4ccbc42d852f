import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { oneTimeLink, waitForMailTo } from "../helpers/captured-mail";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("a coordinator invites a grower, who joins through the mailed link", () => {
  it("works end to end in the browser, the link read from the captured mail as the demo operator does", async () => {
    const email = `new-grower-${Date.now()}@example.org`;
    const staff = await newPage(browser);
    await signIn(staff.page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await staff.page.goto("/portal/cooperators");
    await staff.page.getByRole("heading", { name: "Partner growers" }).waitFor();

    // A malformed e-mail gets a message under the field and sends nothing.
    await staff.page.getByLabel("Grower's name").fill("Nell Ashby");
    await staff.page.getByLabel("E-mail").fill("nell-at-example");
    await staff.page.getByRole("button", { name: "Send invitation" }).click();
    await staff.page.getByText("Enter an e-mail address like name@example.org.").waitFor();
    expect(await staff.page.getByLabel("Grower's name").inputValue()).toBe("Nell Ashby");

    await staff.page.getByLabel("E-mail").fill(email);
    await staff.page.getByLabel("Site", { exact: true }).selectOption({ label: DEMO_SITES[3].name });
    await staff.page.getByRole("button", { name: "Send invitation" }).click();
    await staff.page.getByText(`Invitation sent to ${email}.`).waitFor();

    const [mail] = await waitForMailTo(email);
    const link = oneTimeLink(mail!);
    expect(link).toMatch(/\/invite\/[A-Za-z0-9_-]+$/);
    await staff.context.close();

    const grower = await newPage(browser, { width: 390, height: 844 });
    await grower.page.goto(link);
    await grower.page.getByLabel("Choose a password").fill("short");
    await grower.page.getByLabel("Password again").fill("short");
    await grower.page.getByRole("button", { name: "Set password and continue" }).click();
    await grower.page.getByText("Use at least 10 characters.").waitFor();

    await grower.page.getByLabel("Choose a password").fill("radish-rows-2026");
    await grower.page.getByLabel("Password again").fill("radish-rows-2026");
    await grower.page.getByRole("button", { name: "Set password and continue" }).click();
    // Setting the password signs the grower in: the portal opens, not an empty sign-in form.
    await grower.page.waitForURL("**/portal");
    await grower.page.getByRole("heading", { name: /Hello, Nell/ }).waitFor();
    expect(await grower.page.getByText(DEMO_SITES[3].name).count()).toBeGreaterThan(0);

    // The link is spent, and says so rather than that it expired.
    await grower.page.goto(link);
    expect(await grower.page.getByRole("heading", { name: "This invitation was already used" }).count()).toBe(1);
    await grower.context.close();
  });

  it("shows a clear page for a made-up invitation link", async () => {
    const { page, context } = await newPage(browser);
    await page.goto(`/invite/${"x".repeat(43)}`);
    expect(await page.getByRole("heading", { name: "This invitation link is not valid" }).count()).toBe(1);
    await context.close();
  });
});
