import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { promises as fs } from "node:fs";
import { eq } from "drizzle-orm";
import type { SMTPServer } from "smtp-server";
import * as s from "@/db/schema";
import { startFakeSmtp } from "../../scripts/fake-smtp";
import { updatePasswordWithToken } from "@/db/mutations/users";
import { inviteGrower } from "@/server/users/invitations";
import { issuePasswordReset } from "@/server/auth/password-reset";
import { getSignInRecord, getValidToken } from "@/db/queries/users";
import { deliverPendingMail } from "@/server/mail/outbox";
import { hashPassword, verifyPassword } from "@/server/auth/password";
import { hashToken, newToken } from "@/server/auth/tokens";
import { isAppError } from "@/lib/errors";
import { pool as appPool } from "@/db/index";
import { testDatabase, unique } from "../helpers/db";
import { DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";

const mailboxDir = process.env.MAILBOX_DIR!;
const { db, pool } = testDatabase();
let smtp: SMTPServer;

beforeAll(async () => {
  smtp = await startFakeSmtp({ port: Number(process.env.SMTP_PORT), dir: mailboxDir });
});
afterAll(async () => {
  await new Promise<void>((resolve) => smtp.close(() => resolve()));
  await pool.end();
  await appPool.end();
});

async function capturedTo(address: string) {
  const names = await fs.readdir(mailboxDir).catch(() => [] as string[]);
  const all = await Promise.all(names.map(async (n) => JSON.parse(await fs.readFile(`${mailboxDir}/${n}`, "utf8"))));
  return all.filter((m) => m.to.includes(address)) as { subject: string; text: string }[];
}

/** The demo coordinator and a site of her program. */
async function coordinatorAndSite() {
  const [coordinator] = await db.select({ id: s.users.id, email: s.users.email, name: s.users.name, role: s.users.role }).from(s.users).where(eq(s.users.email, DEMO_STAFF[1].email));
  const [site] = await db.select({ id: s.sites.id, name: s.sites.name }).from(s.sites).where(eq(s.sites.name, DEMO_SITES[0].name));
  return { coordinator: coordinator!, site: site! };
}

describe("invitations end to end through the fake SMTP server", () => {
  it("sends an invite, the link sets a password, and the grower can sign in and is attached to the site", async () => {
    const { coordinator, site } = await coordinatorAndSite();
    const email = `${unique("grower")}@example.org`;
    const token = newToken();
    await inviteGrower({ viewer: coordinator, name: "New Grower", email, siteId: site.id, noticeForAccount: true, token });
    expect(await deliverPendingMail()).toBeGreaterThanOrEqual(1);

    const [mail] = await capturedTo(email);
    expect(mail!.subject).toMatch(/invited/i);
    expect(mail!.text).toContain(site.name);
    const link = mail!.text.match(/\/invite\/([A-Za-z0-9_-]+)/)![1]!;
    expect(link).toBe(token);

    expect(await getValidToken(hashToken(link), "invite")).not.toBeNull();
    await updatePasswordWithToken({ tokenHash: hashToken(link), kind: "invite", passwordHash: await hashPassword("a-new-garden-password"), name: "New Grower" });
    const record = await getSignInRecord(email);
    expect(await verifyPassword(record!.passwordHash, "a-new-garden-password")).toBe(true);
    expect(record!.role).toBe("cooperator");

    const links = await db.select().from(s.siteCooperators).where(eq(s.siteCooperators.userId, record!.id));
    expect(links.map((l) => l.siteId)).toEqual([site.id]);
    // The link works only once.
    await expect(updatePasswordWithToken({ tokenHash: hashToken(link), kind: "invite", passwordHash: "x" })).rejects.toThrow("This invitation was already used.");
  });

  it("refuses an expired invitation and changes nothing", async () => {
    const { coordinator, site } = await coordinatorAndSite();
    const email = `${unique("late")}@example.org`;
    const token = newToken();
    await inviteGrower({ viewer: coordinator, name: "Late Grower", email, siteId: site.id, noticeForAccount: true, token });
    await db.update(s.userTokens).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(s.userTokens.tokenHash, hashToken(token)));

    expect(await getValidToken(hashToken(token), "invite")).toBeNull();
    const error = await updatePasswordWithToken({ tokenHash: hashToken(token), kind: "invite", passwordHash: "hash" }).catch((e) => e);
    expect(isAppError(error) && error.code).toBe("bad_request");
    expect((await getSignInRecord(email))!.passwordHash).toBeNull();
  });

  it("refuses to invite a staff account's e-mail as a grower, writing nothing", async () => {
    const { coordinator, site } = await coordinatorAndSite();
    const before = await db.select().from(s.mailOutbox);
    const error = await inviteGrower({ viewer: coordinator, name: "Someone", email: coordinator.email, siteId: site.id, noticeForAccount: true }).catch((e) => e);
    expect(isAppError(error) && error.code).toBe("conflict");
    expect((await db.select().from(s.mailOutbox)).length).toBe(before.length);
  });

  it("refuses an invite to a site that does not exist and rolls back the new account", async () => {
    const { coordinator } = await coordinatorAndSite();
    const email = `${unique("nosite")}@example.org`;
    const error = await inviteGrower({ viewer: coordinator, name: "X Y", email, siteId: 99999999, noticeForAccount: true }).catch((e) => e);
    expect(isAppError(error) && error.fieldErrors?.siteId).toBeTruthy();
    expect(await getSignInRecord(email)).toBeNull();
  });

  it("resets a password through the mailed link", async () => {
    const email = `${unique("reset")}@example.org`;
    await db.insert(s.users).values({ email, name: "Reset Me", role: "cooperator", passwordHash: await hashPassword("old-password-123") });
    const token = newToken();
    const queued = await issuePasswordReset({ email, token });
    expect(queued).toBe(true);
    await deliverPendingMail();
    const [mail] = await capturedTo(email);
    const link = mail!.text.match(/\/reset-password\/([A-Za-z0-9_-]+)/)![1]!;
    await updatePasswordWithToken({ tokenHash: hashToken(link), kind: "password_reset", passwordHash: await hashPassword("new-password-456") });
    const record = await getSignInRecord(email);
    expect(await verifyPassword(record!.passwordHash, "new-password-456")).toBe(true);
    expect(await verifyPassword(record!.passwordHash, "old-password-123")).toBe(false);
  });

  it("sends no reset mail for an unknown e-mail", async () => {
    const email = `${unique("nobody")}@example.org`;
    expect(await issuePasswordReset({ email })).toBe(false);
    await deliverPendingMail();
    expect(await capturedTo(email)).toEqual([]);
  });
});
