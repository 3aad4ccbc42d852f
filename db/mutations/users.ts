import "server-only";
import { and, eq, isNull, not, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { siteCooperators, sites, users, userTokens } from "../schema";
import type { Role } from "@/lib/domain/vocabulary/enums";
import { insertAudit } from "../audit";
import { requireStaff, staffSiteScope } from "../access";
import { insertMail } from "./mail";
import { AppError } from "@/lib/errors";
import { hashToken } from "@/server/auth/tokens";
import type { Viewer } from "@/lib/domain/viewer";
import type { OutgoingMail } from "@/lib/domain/mail/templates";

const INVITE_DAYS = 7;
const RESET_MINUTES = 60;

// Raising an account's session generation ends every session issued before (see server/auth/config.ts).
const nextGeneration = sql`${users.sessionGeneration} + 1`;

/** Marks a person's unused links of one kind as used, so none of them works any more. */
async function voidOpenTokens(tx: Tx, userId: number, kind: "invite" | "password_reset") {
  await tx
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(userTokens.userId, userId), eq(userTokens.kind, kind), isNull(userTokens.usedAt)));
}

/** What an invitation to a site needs; the caller owns the token and the wording of the mail. */
export interface InviteRequest {
  viewer: Viewer;
  name: string;
  email: string;
  siteId: number;
  token: string;
  /** The invitation with its one-time link, for someone who has not set a password yet. */
  buildMail: (siteName: string) => OutgoingMail;
  /** The notice for someone who already has an account; left out when the caller sends its own (enrolment does). */
  buildNotice?: (p: { name: string; siteName: string }) => OutgoingMail;
}

/**
 * Invites a grower to one of the viewer's sites, all in one transaction: a new account without a password,
 * or a fresh link for someone who never set one, with an invite token and its mail; someone who already has
 * an account is attached to the site and told so. Growers belong to no program, so nothing about their
 * other sites is read, changed or revealed here.
 */
export async function insertCooperatorInvite(p: InviteRequest) {
  return db.transaction((tx) => insertCooperatorInviteInTx(tx, p));
}

/** The invitation itself, inside a caller's transaction (enrolling a site invites its grower this way). */
export async function insertCooperatorInviteInTx(tx: Tx, p: InviteRequest): Promise<{ userId: number; invited: boolean }> {
  requireStaff(p.viewer);
  const [site] = await tx.select({ name: sites.name }).from(sites).where(and(eq(sites.id, p.siteId), staffSiteScope(p.viewer)));
  // An unknown site and another program's site get the same answer.
  if (!site) throw new AppError("bad_request", "Choose one of your program's sites.", { siteId: ["Choose a site from the list."] });
  const [existing] = await tx
    .select({ id: users.id, name: users.name, role: users.role, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.email, p.email))
    .for("update");
  if (existing && existing.role !== "cooperator") {
    throw new AppError("conflict", "This e-mail belongs to a staff account.", { email: ["This e-mail belongs to a staff account."] });
  }
  if (existing && existing.passwordHash !== null) {
    await tx.insert(siteCooperators).values({ siteId: p.siteId, userId: existing.id }).onDuplicateKeyUpdate({ set: { userId: existing.id } });
    if (p.buildNotice) await insertMail(tx, p.buildNotice({ name: existing.name, siteName: site.name }));
    await insertAudit(tx, { actorId: p.viewer.id, action: "attach_site", entity: "user", entityId: existing.id, newValue: { siteId: p.siteId } });
    return { userId: existing.id, invited: false };
  }
  let userId: number;
  if (existing) {
    userId = existing.id;
    // The name is the grower's own once another program works with them too; only its sole programs may correct it.
    if (!(await linkedOutsideViewerPrograms(tx, p.viewer, userId))) await tx.update(users).set({ name: p.name }).where(eq(users.id, userId));
    // Earlier links stop working once a new one is sent.
    await voidOpenTokens(tx, userId, "invite");
  } else {
    const [inserted] = await tx.insert(users).values({ email: p.email, name: p.name, role: "cooperator" }).$returningId();
    userId = inserted!.id;
  }
  await tx.insert(siteCooperators).values({ siteId: p.siteId, userId }).onDuplicateKeyUpdate({ set: { userId } });
  await tx.insert(userTokens).values({
    userId,
    kind: "invite",
    tokenHash: hashToken(p.token),
    expiresAt: new Date(Date.now() + INVITE_DAYS * 86400_000),
    createdById: p.viewer.id,
  });
  await insertMail(tx, p.buildMail(site.name));
  await insertAudit(tx, { actorId: p.viewer.id, action: "invite", entity: "user", entityId: userId, newValue: { email: p.email, siteId: p.siteId } });
  return { userId, invited: true };
}

/** Whether a grower works with a site outside the viewer's programs. */
async function linkedOutsideViewerPrograms(tx: Tx, viewer: Viewer, userId: number) {
  if (viewer.role === "admin") return false;
  const [other] = await tx
    .select({ id: siteCooperators.id })
    .from(siteCooperators)
    .innerJoin(sites, eq(sites.id, siteCooperators.siteId))
    .where(and(eq(siteCooperators.userId, userId), not(staffSiteScope(viewer))))
    .limit(1);
  return !!other;
}

/** Uses a one-time token: sets the password (and name for invites) and marks the token used. */
export async function updatePasswordWithToken(p: { token: string; kind: "invite" | "password_reset"; passwordHash: string; name?: string }) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: userTokens.id, userId: userTokens.userId, expiresAt: userTokens.expiresAt, usedAt: userTokens.usedAt })
      .from(userTokens)
      .where(and(eq(userTokens.tokenHash, hashToken(p.token)), eq(userTokens.kind, p.kind)))
      .for("update");
    if (!row || row.usedAt !== null || row.expiresAt.getTime() <= Date.now()) {
      throw new AppError(
        "bad_request",
        p.kind === "invite"
          ? "This invitation link has expired or was already used. Ask your coordinator to send a new one."
          : "This reset link has expired or was already used. Ask for a new one.",
      );
    }
    // This link and every other open link of its kind stop working.
    await voidOpenTokens(tx, row.userId, p.kind);
    // A new password ends every session signed in with the old one.
    await tx
      .update(users)
      .set({ passwordHash: p.passwordHash, sessionGeneration: nextGeneration, ...(p.name ? { name: p.name } : {}) })
      .where(eq(users.id, row.userId));
    await insertAudit(tx, { actorId: row.userId, action: p.kind === "invite" ? "accept_invite" : "reset_password", entity: "user", entityId: row.userId });
    return { userId: row.userId };
  });
}

/** Stores a reset token and queues its mail when the e-mail belongs to an active account with a password. */
export async function insertPasswordReset(p: { email: string; token: string; buildMail: (name: string) => OutgoingMail }) {
  return db.transaction(async (tx) => {
    const [user] = await tx
      .select({ id: users.id, name: users.name, passwordHash: users.passwordHash })
      .from(users)
      .where(and(eq(users.email, p.email), eq(users.active, true)))
      .for("update");
    if (!user || user.passwordHash === null) return false;
    // Only the newest link works: one forwarded or left in an old mail is void once another is sent.
    await voidOpenTokens(tx, user.id, "password_reset");
    await tx.insert(userTokens).values({
      userId: user.id,
      kind: "password_reset",
      tokenHash: hashToken(p.token),
      expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000),
    });
    await insertMail(tx, p.buildMail(user.name));
    return true;
  });
}

/** Changes a user's role (admin only; checked by the caller) and records it. */
export async function updateUserRole(p: { actorId: number; userId: number; role: Role }) {
  await db.transaction(async (tx) => {
    const [user] = await tx.select({ role: users.role }).from(users).where(eq(users.id, p.userId)).for("update");
    if (!user) throw new AppError("not_found", "That account no longer exists.");
    await tx.update(users).set({ role: p.role }).where(eq(users.id, p.userId));
    await insertAudit(tx, { actorId: p.actorId, action: "change_role", entity: "user", entityId: p.userId, oldValue: { role: user.role }, newValue: { role: p.role } });
  });
}

/** Activates or deactivates an account (admin only; checked by the caller). */
export async function updateUserActive(p: { actorId: number; userId: number; active: boolean }) {
  await db.transaction(async (tx) => {
    const [user] = await tx.select({ active: users.active }).from(users).where(eq(users.id, p.userId)).for("update");
    if (!user) throw new AppError("not_found", "That account no longer exists.");
    // Deactivating ends the account's sessions for good: activating it again does not bring them back.
    await tx
      .update(users)
      .set({ active: p.active, ...(p.active ? {} : { sessionGeneration: nextGeneration }) })
      .where(eq(users.id, p.userId));
    await insertAudit(tx, { actorId: p.actorId, action: p.active ? "activate" : "deactivate", entity: "user", entityId: p.userId, oldValue: { active: user.active }, newValue: { active: p.active } });
  });
}

/**
 * Signing out ends every session of the account (a copied cookie included). Only a session that is
 * still current may do this, so a stale cookie replayed at sign-out cannot end the sessions after it.
 */
export async function endSessions(p: { userId: number; sessionGeneration: number }) {
  await db.transaction(async (tx) => {
    const [result] = await tx
      .update(users)
      .set({ sessionGeneration: nextGeneration })
      .where(and(eq(users.id, p.userId), eq(users.sessionGeneration, p.sessionGeneration)));
    if (result.affectedRows === 0) return;
    await insertAudit(tx, { actorId: p.userId, action: "sign_out", entity: "user", entityId: p.userId });
  });
}
