// A second server of the test build with production-like settings: mail relayed to a real mail server
// (MAIL_MODE unset) and a trusted reverse proxy (TRUSTED_PROXIES), to check what those settings change.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { createDatabase } from "@/db/client";
import { hashPassword } from "@/server/auth/password";
import { SIGN_IN_FAILED, SIGN_IN_THROTTLED } from "@/lib/domain/sign-in-messages";
import { MAX_FAILURES_PER_ADDRESS } from "@/server/auth/throttle";
import { startAppServer, type AppServer } from "../helpers/app-server";
import { madeUpAddress, requestFrom, signInFrom, spareLoopbackAddress } from "../helpers/from-address";

const proxy = spareLoopbackAddress();
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let app: AppServer;
beforeAll(async () => {
  app = await startAppServer({ TRUSTED_PROXIES: `${proxy}, 10.0.0.0/8` });
}, 90_000);
afterAll(async () => {
  await app?.stop();
  await e2e.pool.end();
});

describe("with a real mail server", () => {
  it("has no test mailbox at all: 404 for every role and no link in the portal", async () => {
    for (const [email, password] of [
      [DEMO_STAFF[0].email, DEMO_PASSWORDS.admin],
      [DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator],
      [DEMO_SITES[0].grower.email, DEMO_PASSWORDS.cooperator],
    ] as const) {
      const session = await signInFrom(spareLoopbackAddress(), email, password, {}, app.base);
      expect(session.signedIn).toBe(true);
      const from = spareLoopbackAddress();
      const mailbox = await requestFrom(from, "/portal/mailbox", { headers: { Cookie: session.cookie } }, app.base);
      expect([email, mailbox.status]).toEqual([email, 404]);
      const home = await requestFrom(from, "/portal", { headers: { Cookie: session.cookie } }, app.base);
      expect(home.status).toBe(200);
      expect(home.text).not.toContain("/portal/mailbox");
      expect(home.text).not.toContain("Test mailbox");
    }
  }, 60_000);
});

describe("behind a trusted proxy", () => {
  it("keys the limits on the address the proxy appended, never on what the client wrote before it", async () => {
    const email = `proxied-${Date.now().toString(36)}@example.org`;
    await e2e.pool.query("INSERT INTO users (email, name, role, password_hash, active) VALUES (?, 'Proxy Check', 'cooperator', ?, 1)", [email, await hashPassword("proxied-password-1")]);
    const client = madeUpAddress();
    // The client forges a fresh first entry every time; the proxy appends the address it really came from.
    for (let i = 0; i < MAX_FAILURES_PER_ADDRESS; i += 1) {
      const attempt = await signInFrom(proxy, `nobody-${i}-${Date.now()}@example.org`, "wrong-password-123", { "X-Forwarded-For": `${madeUpAddress()}, ${client}` }, app.base);
      expect([i, attempt.error]).toEqual([i, SIGN_IN_FAILED]);
    }
    const same = await signInFrom(proxy, email, "proxied-password-1", { "X-Forwarded-For": `${madeUpAddress()}, ${client}` }, app.base);
    expect([same.signedIn, same.error]).toEqual([false, SIGN_IN_THROTTLED]);
    // Another client behind the same proxy, through a second trusted hop, is not affected.
    const other = await signInFrom(proxy, email, "proxied-password-1", { "X-Forwarded-For": `${client}, ${madeUpAddress()}, 10.1.2.3` }, app.base);
    expect(other.signedIn).toBe(true);
    // A client connecting directly cannot pose as the locked-out one or as anyone else.
    const direct = await signInFrom(spareLoopbackAddress(), email, "proxied-password-1", { "X-Forwarded-For": client }, app.base);
    expect(direct.signedIn).toBe(true);
  }, 90_000);
});
