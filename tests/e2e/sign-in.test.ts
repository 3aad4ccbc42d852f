import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("sign-in and role homes in a real browser", () => {
  it("shows the coordinator the program overview with trials and late sites", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.getByRole("heading", { name: "Program overview" }).waitFor();
    expect(await page.getByText("Baby-leaf kale in trays under lights").count()).toBe(1);
    const late = page.getByRole("region", { name: "Sites behind schedule" }).or(page.locator("section", { hasText: "Sites behind schedule" }));
    expect(await late.getByText(DEMO_SITES[4].name).count()).toBeGreaterThan(0);
    await context.close();
  });

  it("shows the cooperator their own site and what to record next", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await signIn(page, DEMO_SITES[1].grower.email, DEMO_PASSWORDS.cooperator);
    await page.getByRole("heading", { name: /Hello, Mei/ }).waitFor();
    expect(await page.getByText("What to record next").count()).toBe(1);
    expect(await page.getByText(DEMO_SITES[1].name).count()).toBeGreaterThan(0);
    // Another grower's site never appears.
    expect(await page.getByText(DEMO_SITES[0].name).count()).toBe(0);
    await context.close();
  });

  it("shows the admin users and roles", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[0].email, DEMO_PASSWORDS.admin);
    await page.getByRole("heading", { name: "Administration" }).waitFor();
    await page.getByRole("link", { name: "Manage users" }).click();
    await page.waitForURL("**/portal/admin/users");
    await page.getByRole("heading", { name: "Users and roles" }).waitFor();
    expect(await page.getByRole("cell", { name: DEMO_STAFF[1].email }).count()).toBe(1);
    await context.close();
  });

  it("refuses a cooperator the coordinator and admin pages", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_SITES[0].grower.email, DEMO_PASSWORDS.cooperator);
    for (const path of ["/portal/cooperators", "/portal/admin/users"]) {
      await page.goto(path);
      await page.waitForURL("**/portal/forbidden");
      await page.getByRole("heading", { name: "You don't have access to that page" }).waitFor();
    }
    await context.close();
  });

  it("sends signed-out visitors to sign-in", async () => {
    const { page, context } = await newPage(browser);
    await page.goto("/portal/cooperators");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await context.close();
  });

  it("answers a wrong password and an unknown e-mail with the same clear message", async () => {
    const { page, context } = await newPage(browser);
    for (const [email, password] of [
      [DEMO_STAFF[1].email, "not-the-password"],
      ["nobody-here@example.org", "whatever-123"],
    ]) {
      await page.goto("/sign-in");
      await page.getByLabel("E-mail").fill(email!);
      await page.getByLabel("Password").fill(password!);
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.getByText("That e-mail and password do not match an account").waitFor();
      expect(new URL(page.url()).pathname).toBe("/sign-in");
    }
    await context.close();
  });

  it("explains malformed fields before sending anything", async () => {
    const { page, context } = await newPage(browser);
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill("rosa-at-example");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByText("Enter an e-mail address like name@example.org.").waitFor();
    expect(await page.getByText("Enter your password.").count()).toBe(1);
    expect(await page.getByLabel("E-mail").getAttribute("aria-invalid")).toBe("true");
    await context.close();
  });
});

describe("content security policy", () => {
  it("is sent with every page and the pages break none of it", async () => {
    const { page, context } = await newPage(browser);
    const violations: string[] = [];
    page.on("console", (m) => {
      if (/Content Security Policy|Refused to/i.test(m.text())) violations.push(m.text());
    });
    const first = await page.goto("/");
    expect(first!.headers()["content-security-policy"]).toMatch(/script-src 'self' 'nonce-[^']+' 'strict-dynamic'/);
    expect(first!.headers()["x-frame-options"]).toBe("DENY");
    expect(first!.headers()["x-content-type-options"]).toBe("nosniff");
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.getByRole("heading", { name: "Program overview" }).waitFor();
    await page.goto("/portal/cooperators");
    await page.getByRole("heading", { name: "Partner growers" }).waitFor();
    // The page hydrated (a client form reacts) despite the policy.
    await page.getByRole("button", { name: "Send invitation" }).click();
    await page.getByText("Enter the grower's name.").first().waitFor();
    expect(violations).toEqual([]);
    await context.close();
  });
});
