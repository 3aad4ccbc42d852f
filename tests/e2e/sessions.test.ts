// Sessions end on the server, not only in the browser: sign-out, a new password and deactivation each
// end every session the account had, so a copied cookie stops working; only the newest reset link works.
import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { insertThrowawayGrower } from "../helpers/throwaway-account";
import { DEMO_PASSWORDS, DEMO_STAFF } from "@/db/demo-data";
import { baseUrl, signIn } from "../helpers/browser";
import { e2eBrowserAndDatabase } from "../helpers/e2e-file";
import { httpSession, request, type HttpSession } from "../helpers/http";
import { loadSampleIds } from "../helpers/samples";
import { oneTimeLink, waitForMailTo } from "../helpers/captured-mail";

const { e2e, openPage } = e2eBrowserAndDatabase();

const newAccount = (tag: string) => insertThrowawayGrower(e2e, tag, "Session Check");

/** Whether a session cookie still opens the portal, a JSON route and next-auth's own session endpoint. */
async function stillWorks(session: HttpSession) {
  const page = await request("/portal", session);
  const api = await request("/api/sites", session);
  const own = (await (await request("/api/auth/session", session)).json()) as { user?: unknown };
  await page.body?.cancel();
  await api.body?.cancel();
  return { page: page.status, api: api.status, nextAuthSession: own.user !== undefined };
}
const WORKS = { page: 200, api: 200, nextAuthSession: true };
const ENDED = { page: 307, api: 401, nextAuthSession: false };

/** Signs out the way the Sign out button does: next-auth's sign-out endpoint with its CSRF token. */
async function signOut(session: HttpSession) {
  const csrf = await request("/api/auth/csrf", session);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const csrfCookie = csrf.headers.getSetCookie().map((c) => c.split(";", 1)[0]!);
  const response = await request("/api/auth/signout", { ...session, cookie: [session.cookie, ...csrfCookie].join("; ") }, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ csrfToken, json: "true" }).toString(),
  });
  expect(response.status).toBe(200);
  await response.body?.cancel();
}

async function askForResetLink(page: Page, email: string) {
  await page.goto("/forgot-password");
  await page.getByLabel("E-mail").fill(email);
  await page.getByRole("button", { name: "Send reset link" }).click();
  await page.getByText("If that e-mail belongs to a Seedplot account").waitFor();
}

async function setNewPassword(page: Page, link: string, password: string) {
  await page.goto(link);
  await page.getByLabel("New password", { exact: true }).fill(password);
  await page.getByLabel("New password again").fill(password);
  await page.getByRole("button", { name: "Set new password" }).click();
  await page.waitForURL("**/sign-in?reset=1");
}

describe("sessions end on the server", () => {
  it("a session cookie replayed after sign-out no longer works, and signing out ends the account's other sessions", async () => {
    const account = await newAccount("signout");
    const laptop = await httpSession(account.email, account.password);
    const phone = await httpSession(account.email, account.password);
    expect(await stillWorks(laptop)).toEqual(WORKS);
    await signOut(laptop);
    expect(await stillWorks(laptop)).toEqual(ENDED);
    expect(await stillWorks(phone)).toEqual(ENDED);
    // Signing in again works as before.
    const again = await httpSession(account.email, account.password);
    expect(await stillWorks(again)).toEqual(WORKS);
    // A stale cookie cannot sign out the session that came after it.
    await signOut(laptop);
    expect(await stillWorks(again)).toEqual(WORKS);
  });

  it("a grower's cookie that keeps saving is checked afresh on every save: a role change and a sign-out count at the next save", async () => {
    const account = await newAccount("saving");
    const ids = await loadSampleIds(e2e.pool);
    const [[grower]] = (await e2e.pool.query("SELECT id FROM users WHERE email = ?", [account.email])) as unknown as [[{ id: number }]];
    const [[quality]] = (await e2e.pool.query("SELECT id FROM traits WHERE code = 'quality'")) as unknown as [[{ id: number }]];
    // A plot of site A with no quality value yet, so the test leaves the demo data as it found it.
    const [[plot]] = (await e2e.pool.query(
      "SELECT p.id FROM plots p JOIN enrolments e ON e.id = p.enrolment_id WHERE e.trial_id = ? AND e.site_id = ? AND NOT EXISTS (SELECT 1 FROM observations o WHERE o.plot_id = p.id AND o.trait_id = ?) ORDER BY p.id DESC LIMIT 1",
      [ids.kal, ids.siteA, quality!.id],
    )) as unknown as [[{ id: number }]];
    // The throwaway grower helps on site A, so the save reaches the site through site_cooperators.
    await e2e.pool.query("INSERT INTO site_cooperators (site_id, user_id) VALUES (?, ?)", [ids.siteA, grower!.id]);
    const save = async (session: HttpSession, value: string) => {
      const response = await request("/api/observations", session, {
        method: "POST",
        headers: { "Content-Type": "application/json", Origin: new URL(baseUrl).origin },
        body: JSON.stringify({ trialId: ids.kal, siteId: ids.siteA, values: [{ plotId: plot!.id, key: "quality", value }] }),
      });
      await response.body?.cancel();
      return response.status;
    };
    try {
      const phone = await httpSession(account.email, account.password);
      expect(await save(phone, "4")).toBe(200);
      expect(await save(phone, "5")).toBe(200);
      // A coordinator of no program reaches no site: the same cookie now answers as for a site that is not theirs.
      await e2e.pool.query("UPDATE users SET role = 'coordinator' WHERE id = ?", [grower!.id]);
      expect(await save(phone, "6")).toBe(404);
      await e2e.pool.query("UPDATE users SET role = 'cooperator' WHERE id = ?", [grower!.id]);
      expect(await save(phone, "6")).toBe(200);
      await signOut(phone);
      expect(await save(phone, "7")).toBe(401);
      const [[stored]] = (await e2e.pool.query("SELECT value_number AS v FROM observations WHERE plot_id = ? AND trait_id = ?", [plot!.id, quality!.id])) as unknown as [[{ v: number }]];
      expect(Number(stored!.v)).toBe(6);
    } finally {
      await e2e.pool.query("DELETE FROM observations WHERE plot_id = ? AND trait_id = ?", [plot!.id, quality!.id]);
      await e2e.pool.query("DELETE FROM site_cooperators WHERE user_id = ?", [grower!.id]);
    }
  });

  it("a session from before a password reset stops working once the new password is set", async () => {
    const account = await newAccount("reset");
    const before = await httpSession(account.email, account.password);
    expect(await stillWorks(before)).toEqual(WORKS);
    const { page, context } = await openPage();
    await askForResetLink(page, account.email);
    const [mail] = await waitForMailTo(account.email, { subject: /Reset your Seedplot password/ });
    await setNewPassword(page, oneTimeLink(mail!), "second-password-reset");
    await context.close();
    expect(await stillWorks(before)).toEqual(ENDED);
    expect(await stillWorks(await httpSession(account.email, "second-password-reset"))).toEqual(WORKS);
  });

  it("issuing a reset link voids the earlier one: of two links only the newer works", async () => {
    const account = await newAccount("twolinks");
    const { page, context } = await openPage();
    await askForResetLink(page, account.email);
    await waitForMailTo(account.email, { subject: /Reset your Seedplot password/ });
    await askForResetLink(page, account.email);
    const [older, newer] = (await waitForMailTo(account.email, { subject: /Reset your Seedplot password/, count: 2 })).map(oneTimeLink);
    expect(older).not.toBe(newer);
    await page.goto(older!);
    await page.getByRole("heading", { name: "This link no longer works" }).waitFor();
    await setNewPassword(page, newer!, "newest-link-password");
    // And the older one stays void after the newer was used.
    await page.goto(older!);
    await page.getByRole("heading", { name: "This link no longer works" }).waitFor();
    await context.close();
  });

  it("deactivating an account ends its sessions, and reactivating it does not bring them back", async () => {
    const account = await newAccount("deactivate");
    const session = await httpSession(account.email, account.password);
    expect(await stillWorks(session)).toEqual(WORKS);
    const { page, context } = await openPage();
    await signIn(page, DEMO_STAFF[0].email, DEMO_PASSWORDS.admin);
    await page.goto("/portal/admin/users");
    const row = page.getByRole("row", { name: new RegExp(account.email.replace(/[.]/g, "\\.")) });
    await row.getByRole("button", { name: "Deactivate" }).click();
    await page.getByRole("dialog").getByRole("button", { name: "Deactivate account" }).click();
    await page.getByText("Account deactivated.").waitFor();
    expect(await stillWorks(session)).toEqual(ENDED);
    await page.reload();
    await row.getByRole("button", { name: "Reactivate" }).click();
    await page.getByRole("dialog").getByRole("button", { name: "Reactivate account" }).click();
    await page.getByText("Account activated.").waitFor();
    await context.close();
    expect(await stillWorks(session)).toEqual(ENDED);
    expect(await stillWorks(await httpSession(account.email, account.password))).toEqual(WORKS);
  }, 60_000);
});
