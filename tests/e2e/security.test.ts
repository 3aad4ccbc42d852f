import { describe, expect, it } from "vitest";
import { DEMO_PASSWORDS, DEMO_STAFF } from "@/db/demo-data";
import { hashPassword } from "@/server/auth/password";
import { SIGN_IN_THROTTLED } from "@/lib/domain/sign-in-messages";
import { signIn } from "../helpers/browser";
import { e2eBrowserAndDatabase } from "../helpers/e2e-file";
import { credentialsSignIn, httpSession, request } from "../helpers/http";

const { e2e, openPage } = e2eBrowserAndDatabase();

const HOSTILE = `<script>alert(1)</script>'; DROP TABLE users; --`;

describe("session cookies and security headers", () => {
  it("sets the session cookie httpOnly and SameSite=Lax", async () => {
    const session = await httpSession(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    const cookie = session.setCookies.find((c) => c.split("=", 1)[0]!.endsWith("next-auth.session-token"));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/;\s*HttpOnly/i);
    expect(cookie).toMatch(/;\s*SameSite=Lax/i);
  });

  it("sends frame denial, no-sniff and a nonce policy with public, auth and portal pages", async () => {
    const session = await httpSession(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    for (const [path, who] of [["/", null], ["/results", null], ["/sign-in", null], ["/forgot-password", null], ["/portal/catalogue", session]] as const) {
      const response = await request(path, who);
      expect([path, response.status]).toEqual([path, 200]);
      expect([path, response.headers.get("x-frame-options")]).toEqual([path, "DENY"]);
      expect([path, response.headers.get("x-content-type-options")]).toEqual([path, "nosniff"]);
      expect([path, /script-src 'self' 'nonce-[^']+' 'strict-dynamic'.*frame-ancestors 'none'/.test(response.headers.get("content-security-policy") ?? "")]).toEqual([path, true]);
      await response.body?.cancel();
    }
  });
});

describe("undecodable addresses", () => {
  it("answer 400 with a plain message instead of a server error", async () => {
    for (const path of ["/api/trials/%ED%A0%80", "/results/%C3%28", "/portal/plots/%FF"]) {
      const response = await request(path, null);
      expect([path, response.status]).toEqual([path, 400]);
      expect(await response.text()).toBe("That address is not valid.");
    }
  });
});

describe("sign-in throttle", () => {
  it("refuses the sixth attempt for one account within the window, even with the right password", async () => {
    const email = `throttle-${Date.now().toString(36)}@example.org`;
    const password = "right-password-for-throttle";
    await e2e.pool.query("INSERT INTO users (email, name, role, password_hash, active) VALUES (?, 'Throttle Check', 'cooperator', ?, 1)", [email, await hashPassword(password)]);
    const errorOf = (url: string | undefined) => new URL(url ?? "http://x/").searchParams.get("error");
    for (let i = 0; i < 5; i++) {
      const attempt = await credentialsSignIn(email, `wrong-${i}`);
      expect(attempt.signedIn).toBe(false);
      expect(errorOf(attempt.body.url)).not.toBe(SIGN_IN_THROTTLED);
    }
    const sixth = await credentialsSignIn(email, password);
    expect(sixth.signedIn).toBe(false);
    expect(errorOf(sixth.body.url)).toBe(SIGN_IN_THROTTLED);
    expect(SIGN_IN_THROTTLED).toMatch(/^Too many sign-in attempts/);
  });
});

describe("injection strings in catalogue text", () => {
  it("shows a hostile crop and variety name as text, never as markup, and leaves the users table in place", async () => {
    const { page, context } = await openPage();
    const scriptRan: string[] = [];
    page.on("dialog", async (d) => {
      scriptRan.push(d.message());
      await d.dismiss();
    });
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto("/portal/catalogue");
    const crop = `Crop ${Date.now().toString(36)} ${HOSTILE}`;
    await page.locator("#crop-name").fill(crop);
    await page.getByLabel("Crop group").selectOption({ index: 1 });
    await page.getByLabel("Scientific name (optional)").fill(HOSTILE);
    await page.getByRole("button", { name: /Add crop/i }).click();
    await page.getByText(`${crop} added to the catalogue.`).waitFor();
    await page.reload();
    await page.locator("#variety-crop").selectOption({ label: crop });
    const variety = `Variety ${Date.now().toString(36)} ${HOSTILE}`;
    await page.locator("#variety-name").fill(variety);
    await page.getByLabel("Notes (optional)").fill(HOSTILE);
    await page.getByRole("button", { name: /Add variety/i }).click();
    await page.getByText(`${variety} added.`).waitFor();
    await page.reload();
    expect(await page.getByText(variety).count()).toBeGreaterThan(0);
    expect(scriptRan).toEqual([]);
    await context.close();

    const session = await httpSession(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    const html = await (await request("/portal/catalogue", session)).text();
    expect(html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(html).not.toContain("<script>alert(1)</script>");
    expect(html).toContain("&#x27;; DROP TABLE users; --");
    const [[users]] = (await e2e.pool.query("SELECT COUNT(*) AS n FROM users")) as unknown as [[{ n: number }]];
    expect(users.n).toBeGreaterThan(5);
    const [[stored]] = (await e2e.pool.query("SELECT name FROM varieties WHERE name = ?", [variety])) as unknown as [[{ name: string }]];
    expect(stored.name).toBe(variety);
  }, 60_000);
});
