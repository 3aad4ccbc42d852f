// Staff accounts: the admin invites coordinators and admins by e-mail and assigns coordinators to programs;
// the users page shows where each invitation stands; a deactivated person who knows the password is told
// why they cannot sign in, and nobody else learns anything.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, desc, eq, inArray } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { testDatabase, unique } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const actions = await import("@/server/actions/users");
const { inviteStaff } = await import("@/server/users/staff");
const { updatePasswordWithToken } = await import("@/db/mutations/users");
const { listUsersForAdmin, getInvitationLink } = await import("@/db/queries/users");
const { listSeasonsForStaff } = await import("@/db/queries/seasons");
const { invitationState, invitationLinkAnswer } = await import("@/lib/domain/invitations");
const { hashToken } = await import("@/server/auth/tokens");
const { hashPassword } = await import("@/server/auth/password");
const { authOptions } = await import("@/server/auth/config");
const { runAsClientAddress } = await import("@/server/auth/request-address");
const { SIGN_IN_FAILED } = await import("@/lib/domain/sign-in-messages");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let admin: Viewer;
let rosa: Viewer;
let grower: Viewer;
let tamarackId: number;
let juniperId: number;
const createdEmails: string[] = [];
const newEmail = (prefix: string) => {
  const email = `${unique(prefix)}@example.test`;
  createdEmails.push(email);
  return email;
};

type Result = { ok: boolean; message?: string; formError?: string; fieldErrors?: Record<string, string[]> };
async function as(viewer: Viewer, action: (prev: null, form: FormData) => Promise<unknown>, fields: Record<string, string | number>) {
  auth.viewer = viewer;
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, String(v));
  return (await action(null, form)) as Result;
}

async function account(email: string) {
  const [row] = await db.select().from(s.users).where(eq(s.users.email, email));
  return row!;
}

/** The link in the newest mail queued to `email`. */
async function newestLink(email: string) {
  const [mail] = await db.select().from(s.mailOutbox).where(eq(s.mailOutbox.toAddress, email)).orderBy(desc(s.mailOutbox.id)).limit(1);
  return { mail: mail!, token: mail!.textBody.match(/\/invite\/([A-Za-z0-9_-]+)/)![1]! };
}

const programsOf = async (userId: number) => (await db.select({ id: s.programCoordinators.programId }).from(s.programCoordinators).where(eq(s.programCoordinators.userId, userId))).map((r) => r.id).sort();

/** Signs in through next-auth's own credentials check, from an address of this file alone (so no other file's attempts throttle it). */
async function signInWith(email: string, password: string): Promise<{ ok: true } | { error: string }> {
  const provider = authOptions.providers[0] as unknown as { options: { authorize: (c: Record<string, string>) => Promise<unknown> } };
  try {
    await runAsClientAddress(`203.0.113.${Math.floor(Math.random() * 200) + 1}`, () => provider.options.authorize({ email, password }));
    return { ok: true };
  } catch (e) {
    return { error: (e as Error).message };
  }
}

async function inviteCoordinator(programIds: number[]) {
  const email = newEmail("coordinator");
  const result = await as(admin, actions.inviteStaffMember, { name: "Hazel Quist", email, role: "coordinator", ...Object.fromEntries(programIds.map((id) => [`program_${id}`, "on"])) });
  expect(result, JSON.stringify(result)).toMatchObject({ ok: true });
  return email;
}

beforeAll(async () => {
  [admin, rosa, grower] = await Promise.all([demoViewer(db, DEMO_STAFF[0].email), demoViewer(db, DEMO_STAFF[1].email), demoViewer(db, DEMO_SITES[0].grower.email)]);
  const programs = await db.select({ id: s.programs.id, slug: s.programs.slug }).from(s.programs);
  juniperId = programs.find((p) => p.slug === DEMO_SECOND_PROGRAM.slug)!.id;
  tamarackId = programs.find((p) => p.slug === "tamarack-valley")!.id;
});

afterAll(async () => {
  auth.viewer = null;
  if (createdEmails.length) {
    await db.delete(s.mailOutbox).where(inArray(s.mailOutbox.toAddress, createdEmails));
    await db.delete(s.users).where(inArray(s.users.email, createdEmails));
  }
  await pool.end();
  await appPool.end();
});

describe("staff invitations and programs", () => {
  it("an admin invites a coordinator to a program; the mailed link sets her password and she runs only that program", async () => {
    const email = await inviteCoordinator([juniperId]);
    const invited = await account(email);
    expect(invited).toMatchObject({ role: "coordinator", passwordHash: null, active: true });
    expect(await programsOf(invited.id)).toEqual([juniperId]);
    const { mail, token } = await newestLink(email);
    expect(mail.subject).toBe("You're invited to Seedplot as coordinator");
    expect(mail.textBody).toContain(DEMO_SECOND_PROGRAM.name);
    const [audit] = await db.select().from(s.auditLog).where(and(eq(s.auditLog.entity, "user"), eq(s.auditLog.entityId, String(invited.id)), eq(s.auditLog.action, "invite_staff")));
    expect(audit!.actorId).toBe(admin.id);

    await updatePasswordWithToken({ tokenHash: hashToken(token), kind: "invite", passwordHash: await hashPassword("hazel-tunnel-2027"), name: "Hazel Quist" });
    expect(await signInWith(email, "hazel-tunnel-2027")).toEqual({ ok: true });
    const hazel = await demoViewer(db, email);
    const seasons = await listSeasonsForStaff(hazel);
    expect(seasons.length).toBeGreaterThan(0);
    expect(new Set(seasons.map((x) => x.programId))).toEqual(new Set([juniperId]));
  });

  it("an admin invites another admin, who needs no program", async () => {
    const email = newEmail("admin");
    expect(await as(admin, actions.inviteStaffMember, { name: "Ivo Brandt", email, role: "admin", [`program_${juniperId}`]: "on" })).toMatchObject({ ok: true });
    const invited = await account(email);
    expect(invited.role).toBe("admin");
    expect(await programsOf(invited.id)).toEqual([]);
  });

  it("a coordinator invitation needs a program, and an e-mail that has an account is refused", async () => {
    const none = await as(admin, actions.inviteStaffMember, { name: "No Program", email: newEmail("noprog"), role: "coordinator" });
    expect(none).toMatchObject({ ok: false, fieldErrors: { programIds: ["Tick at least one program for the coordinator."] } });
    const taken = await as(admin, actions.inviteStaffMember, { name: "Rosa Again", email: DEMO_STAFF[1].email, role: "admin" });
    expect(taken).toMatchObject({ ok: false, fieldErrors: { email: ["This e-mail already has a Seedplot account. Change its role in the list above instead."] } });
    expect((await account(DEMO_STAFF[1].email)).role).toBe("coordinator");
  });

  it("only an admin invites staff, assigns programs or changes roles: a coordinator cannot make herself admin", async () => {
    const refused = "Your account does not have access to this.";
    const email = newEmail("by-rosa");
    expect(await as(rosa, actions.inviteStaffMember, { name: "Friend of Rosa", email, role: "admin" })).toMatchObject({ ok: false, formError: refused });
    expect(await db.select().from(s.users).where(eq(s.users.email, email))).toEqual([]);
    expect(await as(rosa, actions.changeUserRole, { userId: rosa.id, role: "admin" })).toMatchObject({ ok: false, formError: refused });
    expect(await as(rosa, actions.setCoordinatorPrograms, { userId: rosa.id, [`program_${juniperId}`]: "on", [`program_${tamarackId}`]: "on" })).toMatchObject({ ok: false, formError: refused });
    expect(await as(grower, actions.resendUserInvitation, { userId: grower.id })).toMatchObject({ ok: false, formError: refused });
    expect((await account(DEMO_STAFF[1].email)).role).toBe("coordinator");
    expect(await programsOf(rosa.id)).toEqual([tamarackId]);
    // The use case refuses too, whoever calls it.
    await expect(inviteStaff({ viewer: rosa, name: "Friend of Rosa", email, role: "admin", programIds: [] })).rejects.toThrow("Only an administrator can invite staff");
    // And an admin cannot deactivate herself or change her own role.
    expect(await as(admin, actions.setUserActive, { userId: admin.id, active: "false" })).toMatchObject({ ok: false, formError: "You cannot deactivate your own account." });
    expect(await as(admin, actions.changeUserRole, { userId: admin.id, role: "coordinator" })).toMatchObject({ ok: false, formError: "You cannot change your own role." });
    expect((await account(DEMO_STAFF[0].email))).toMatchObject({ role: "admin", active: true });
  });

  it("an admin assigns a coordinator to programs, with an audit entry of before and after", async () => {
    const email = await inviteCoordinator([tamarackId]);
    const { id } = await account(email);
    expect(await as(admin, actions.setCoordinatorPrograms, { userId: id, [`program_${juniperId}`]: "on", [`program_${tamarackId}`]: "on" })).toMatchObject({ ok: true, message: "Hazel Quist's programs were saved." });
    expect(await programsOf(id)).toEqual([tamarackId, juniperId].sort());
    expect(await as(admin, actions.setCoordinatorPrograms, { userId: id, [`program_${juniperId}`]: "on" })).toMatchObject({ ok: true });
    expect(await programsOf(id)).toEqual([juniperId]);
    const audits = await db.select().from(s.auditLog).where(and(eq(s.auditLog.entityId, String(id)), eq(s.auditLog.action, "assign_programs"))).orderBy(s.auditLog.id);
    expect(audits.map((a) => [a.oldValue, a.newValue])).toEqual([
      [{ programIds: [tamarackId] }, { programIds: [tamarackId, juniperId].sort((a, b) => a - b) }],
      [{ programIds: [tamarackId, juniperId].sort((a, b) => a - b) }, { programIds: [juniperId] }],
    ]);
    // Programs belong to coordinators only, and an unknown program is refused.
    expect(await as(admin, actions.setCoordinatorPrograms, { userId: grower.id, [`program_${juniperId}`]: "on" })).toMatchObject({ ok: false });
    expect(await as(admin, actions.setCoordinatorPrograms, { userId: id, program_999999: "on" })).toMatchObject({ ok: false });
    expect(await programsOf(id)).toEqual([juniperId]);
  });
});

describe("invitation states", () => {
  it("the users page reads each invitation as pending, expired, used or cancelled", async () => {
    const [pending, expired, used, cancelled] = [await inviteCoordinator([juniperId]), await inviteCoordinator([juniperId]), await inviteCoordinator([juniperId]), await inviteCoordinator([juniperId])];
    await db.update(s.userTokens).set({ expiresAt: new Date(Date.now() - 60_000) }).where(eq(s.userTokens.userId, (await account(expired)).id));
    await updatePasswordWithToken({ tokenHash: hashToken((await newestLink(used)).token), kind: "invite", passwordHash: await hashPassword("used-link-password") });
    expect(await as(admin, actions.cancelUserInvitation, { userId: (await account(cancelled)).id })).toMatchObject({ ok: true, message: "Hazel Quist's invitation is cancelled; the link no longer works." });

    const now = new Date();
    const rows = await listUsersForAdmin(admin);
    const stateOf = (email: string) => {
      const row = rows.find((r) => r.email === email)!;
      return invitationState({ hasPassword: row.hasPassword, newest: row.newestInvitation, now });
    };
    expect([pending, expired, used, cancelled].map(stateOf)).toEqual(["pending", "expired", "used", "cancelled"]);
    // Demo accounts were never invited through a link.
    expect(stateOf(DEMO_STAFF[1].email)).toBeNull();
    // Every row says when its person last signed in (or that they never did).
    expect(rows.every((r) => "lastSignedInAt" in r)).toBe(true);
  });

  it("resend sends a fresh link and the earlier one stops working; cancel stops the link", async () => {
    const email = await inviteCoordinator([juniperId]);
    const { id } = await account(email);
    const first = (await newestLink(email)).token;
    expect(await as(admin, actions.resendUserInvitation, { userId: id })).toMatchObject({ ok: true, message: `A new invitation link was sent to ${email}. Earlier links no longer work.` });
    const second = (await newestLink(email)).token;
    expect(second).not.toBe(first);
    const answer = async (token: string) => {
      const link = await getInvitationLink(hashToken(token));
      return invitationLinkAnswer({ link, hasPassword: !!link?.hasPassword, active: !!link?.active, now: new Date() });
    };
    expect(await answer(first)).toBe("withdrawn");
    expect(await answer(second)).toBe("valid");
    await expect(updatePasswordWithToken({ tokenHash: hashToken(first), kind: "invite", passwordHash: "x" })).rejects.toThrow("This invitation link no longer works.");
    await as(admin, actions.cancelUserInvitation, { userId: id });
    expect(await answer(second)).toBe("withdrawn");
  });

  it("a used invitation link says it was already used, not that it has expired", async () => {
    const email = await inviteCoordinator([juniperId]);
    const { token } = await newestLink(email);
    await updatePasswordWithToken({ tokenHash: hashToken(token), kind: "invite", passwordHash: await hashPassword("first-and-only") });
    const link = await getInvitationLink(hashToken(token));
    expect(invitationLinkAnswer({ link, hasPassword: link!.hasPassword, active: link!.active, now: new Date() })).toBe("used");
    const error = await updatePasswordWithToken({ tokenHash: hashToken(token), kind: "invite", passwordHash: "again" }).catch((e: Error) => e);
    expect((error as Error).message).toBe("This invitation was already used. Sign in with the password you chose, or reset it from the sign-in page if you forgot it.");
    expect((error as Error).message).not.toMatch(/expired/);
  });

  it("an expired link says it has expired", async () => {
    const email = await inviteCoordinator([juniperId]);
    const { token } = await newestLink(email);
    await db.update(s.userTokens).set({ expiresAt: new Date(Date.now() - 60_000) }).where(eq(s.userTokens.tokenHash, hashToken(token)));
    const error = await updatePasswordWithToken({ tokenHash: hashToken(token), kind: "invite", passwordHash: "late" }).catch((e: Error) => e);
    expect((error as Error).message).toBe("This invitation link has expired. Ask the person who invited you to send a new one.");
  });
});

describe("signing in", () => {
  it("records the last sign-in", async () => {
    const email = await inviteCoordinator([juniperId]);
    await updatePasswordWithToken({ tokenHash: hashToken((await newestLink(email)).token), kind: "invite", passwordHash: await hashPassword("last-sign-in-check") });
    expect((await account(email)).lastSignedInAt).toBeNull();
    expect(await signInWith(email, "last-sign-in-check")).toEqual({ ok: true });
    expect((await account(email)).lastSignedInAt).not.toBeNull();
  });

  it("a deactivated person with the right password is told the account is deactivated and whom to ask; a wrong password gets the usual answer", async () => {
    const email = await inviteCoordinator([juniperId]);
    await updatePasswordWithToken({ tokenHash: hashToken((await newestLink(email)).token), kind: "invite", passwordHash: await hashPassword("soon-deactivated") });
    const { id } = await account(email);
    expect(await as(admin, actions.setUserActive, { userId: id, active: "false" })).toMatchObject({ ok: true, message: "Account deactivated." });

    expect(await signInWith(email, "soon-deactivated")).toEqual({
      error: `This account has been deactivated, so it cannot sign in. Ask ${admin.name} (${admin.email}) to reactivate it if you still need it.`,
    });
    // Without the password nothing tells the account apart from one that does not exist.
    expect(await signInWith(email, "a-wrong-guess")).toEqual({ error: SIGN_IN_FAILED });
    expect(await signInWith(newEmail("nobody"), "a-wrong-guess")).toEqual({ error: SIGN_IN_FAILED });
    expect((await account(email)).lastSignedInAt).toBeNull();
  });
});
