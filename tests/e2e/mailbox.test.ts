// The Test mailbox (mail captured by the local fake SMTP server) shows each signed-in person only the
// messages addressed to them: a reset or invitation link for someone else would let the reader act as them.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { httpSession, request } from "../helpers/http";
import { oneTimeLink, waitForMailTo } from "../helpers/captured-mail";

const ADMIN = DEMO_STAFF[0].email;
const COORDINATOR = DEMO_STAFF[1].email;
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function askForResetLink(page: Page, email: string) {
  await page.goto("/forgot-password");
  await page.getByLabel("E-mail").fill(email);
  await page.getByRole("button", { name: "Send reset link" }).click();
  await page.getByText("If that e-mail belongs to a Seedplot account").waitFor();
}

/** Everything the server sends for the mailbox page: the HTML and the data a client navigation fetches. */
async function mailboxAsSeenBy(email: string, password: string) {
  const session = await httpSession(email, password);
  const html = await (await request("/portal/mailbox", session)).text();
  const flight = await (await request("/portal/mailbox", session, { headers: { RSC: "1" } })).text();
  return `${html}\n${flight}`;
}

describe("test mailbox", () => {
  it("a coordinator cannot read a reset link meant for another account", async () => {
    const { page, context } = await newPage(browser);
    await askForResetLink(page, ADMIN);
    const mails = await waitForMailTo(ADMIN, { subject: /Reset your Seedplot password/ });
    const link = oneTimeLink(mails.at(-1)!);
    const token = link.split("/").pop()!;
    const seen = await mailboxAsSeenBy(COORDINATOR, DEMO_PASSWORDS.coordinator);
    expect(seen).toContain("Test mailbox");
    expect(seen).not.toContain(token);
    expect(seen).not.toContain(`To ${ADMIN}`);
    // Not in the browser either, after the page has run.
    await signIn(page, COORDINATOR, DEMO_PASSWORDS.coordinator);
    await page.goto("/portal/mailbox");
    await page.getByRole("heading", { name: "Test mailbox" }).waitFor();
    expect(await page.content()).not.toContain(token);
    await context.close();
  });

  it("a coordinator cannot read the invitation link they sent a grower", async () => {
    const email = `mailbox-invite-${Date.now()}@example.org`;
    const { page, context } = await newPage(browser);
    await signIn(page, COORDINATOR, DEMO_PASSWORDS.coordinator);
    await page.goto("/portal/cooperators");
    await page.getByLabel("Grower's name").fill("Ivo Marsh");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Site", { exact: true }).selectOption({ label: DEMO_SITES[3].name });
    await page.getByRole("button", { name: "Send invitation" }).click();
    await page.getByText(`Invitation sent to ${email}.`).waitFor();
    const [mail] = await waitForMailTo(email);
    const token = oneTimeLink(mail!).split("/").pop()!;
    await page.goto("/portal/mailbox");
    await page.getByRole("heading", { name: "Test mailbox" }).waitFor();
    expect(await page.content()).not.toContain(token);
    expect(await page.getByText(email).count()).toBe(0);
    await context.close();
  });

  it("shows a signed-in person the messages addressed to them, with the app's links", async () => {
    const grower = DEMO_SITES[2].grower.email;
    const { page, context } = await newPage(browser);
    await askForResetLink(page, grower);
    const mails = await waitForMailTo(grower, { subject: /Reset your Seedplot password/ });
    const link = oneTimeLink(mails.at(-1)!);
    await signIn(page, grower, DEMO_PASSWORDS.cooperator);
    await page.getByRole("navigation", { name: "Portal" }).getByRole("link", { name: "Test mailbox" }).click();
    await page.getByRole("heading", { name: "Test mailbox" }).waitFor();
    expect(await page.getByRole("link", { name: link }).getAttribute("href")).toBe(link);
    // Only their own: nothing addressed to anyone else is listed.
    const recipients = await page.getByText(/^To /).allTextContents();
    expect(recipients.length).toBeGreaterThan(0);
    for (const line of recipients) expect(line).toMatch(new RegExp(`^To ${grower.replace(/[.]/g, "\\.")} ·`));
    await context.close();
  });
});
