import "server-only";
import { and, asc, eq, inArray, isNull, not, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { programCoordinators, programs, siteCooperators, sites, users, userTokens } from "../schema";
import type { Locale, Role } from "@/lib/domain/vocabulary/enums";
import { insertAudit } from "../audit";
import { isDuplicateKey, requireStaff, staffSiteScope } from "../access";
import { insertMail } from "./mail";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import type { OutgoingMail } from "@/lib/domain/mail/templates";

// Raising an account's session generation ends every session issued before (see server/auth/config.ts).
const nextGeneration = sql`${users.sessionGeneration} + 1`;

/** Marks a person's unused links of one kind as used, so none of them works any more. */
async function voidOpenTokens(tx: Tx, userId: number, kind: "invite" | "password_reset") {
  await tx
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(userTokens.userId, userId), eq(userTokens.kind, kind), isNull(userTokens.usedAt)));
}

/** One of the viewer's program's sites; an unknown site and another program's site get the same answer. */
export async function getStaffSite(tx: Tx, viewer: Viewer, siteId: number) {
  requireStaff(viewer);
  const [site] = await tx.select({ id: sites.id, name: sites.name }).from(sites).where(and(eq(sites.id, siteId), staffSiteScope(viewer)));
  if (!site) throw new AppError("bad_request", "Choose one of your program's sites.", { siteId: ["Choose a site from the list."] });
  return site;
}

/** The account with this e-mail, locked for the rest of the transaction; `hasPassword` is false until an invitation is accepted. */
export async function lockAccountByEmail(tx: Tx, email: string) {
  const [account] = await tx
    .select({ id: users.id, name: users.name, role: users.role, active: users.active, locale: users.locale, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.email, email))
    .for("update");
  if (!account) return null;
  const { passwordHash, ...rest } = account;
  return { ...rest, hasPassword: passwordHash !== null };
}

/** Attaches a grower to a site (nothing changes when they already are). */
export async function insertSiteCooperator(tx: Tx, p: { siteId: number; userId: number }) {
  await tx.insert(siteCooperators).values({ siteId: p.siteId, userId: p.userId }).onDuplicateKeyUpdate({ set: { userId: p.userId } });
}

/** Attaches a grower who already has an account to a site, with its notice mail and an audit entry. */
export async function insertSiteAttachment(tx: Tx, p: { viewer: Viewer; siteId: number; userId: number; mail: OutgoingMail | null }) {
  await insertSiteCooperator(tx, p);
  if (p.mail) await insertMail(tx, p.mail);
  await insertAudit(tx, { actorId: p.viewer.id, action: "attach_site", entity: "user", entityId: p.userId, newValue: { siteId: p.siteId } });
}

/**
 * Stores an invitation to a site: a new account without a password, or a fresh link for `existingUserId`
 * (who never set one; their earlier links stop working), attached to the site, with the token's digest,
 * its mail and an audit entry. Growers belong to no program, so nothing about their other sites is read,
 * changed or revealed here; their name changes only when no other program works with them.
 */
export async function insertInvitation(
  tx: Tx,
  p: { viewer: Viewer; siteId: number; name: string; email: string; locale: Locale; existingUserId: number | null; tokenHash: string; expiresAt: Date; mail: OutgoingMail },
): Promise<number> {
  let userId: number;
  if (p.existingUserId !== null) {
    userId = p.existingUserId;
    if (!(await linkedOutsideViewerPrograms(tx, p.viewer, userId))) await tx.update(users).set({ name: p.name, locale: p.locale }).where(eq(users.id, userId));
    await voidOpenTokens(tx, userId, "invite");
  } else {
    const [inserted] = await tx.insert(users).values({ email: p.email, name: p.name, role: "cooperator", locale: p.locale }).$returningId();
    userId = inserted!.id;
  }
  await insertSiteCooperator(tx, { siteId: p.siteId, userId });
  await tx.insert(userTokens).values({ userId, kind: "invite", tokenHash: p.tokenHash, expiresAt: p.expiresAt, createdById: p.viewer.id });
  await insertMail(tx, p.mail);
  await insertAudit(tx, { actorId: p.viewer.id, action: "invite", entity: "user", entityId: userId, newValue: { email: p.email, siteId: p.siteId } });
  return userId;
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

/** The words a refused link is answered with, in the reader's language (English when the caller gives none). */
export interface LinkRefusalWords {
  resetRefused: string;
  inviteUsedRefused: string;
  inviteExpiredRefused: string;
  inviteDeadRefused: string;
}

const ENGLISH_REFUSALS: LinkRefusalWords = {
  resetRefused: "This reset link has expired or was already used. Ask for a new one.",
  inviteUsedRefused: "This invitation was already used. Sign in with the password you chose, or reset it from the sign-in page if you forgot it.",
  inviteExpiredRefused: "This invitation link has expired. Ask the person who invited you to send a new one.",
  inviteDeadRefused: "This invitation link no longer works. Ask the person who invited you to send a new one.",
};

/** Why a link was refused, in words for the person holding it. */
function linkRefusal(kind: "invite" | "password_reset", row: { usedAt: Date | null; expiresAt: Date; hasPassword: boolean; active: boolean } | undefined, words: LinkRefusalWords) {
  if (kind === "password_reset") return words.resetRefused;
  if (row?.hasPassword) return words.inviteUsedRefused;
  if (row && row.active && row.usedAt === null) return words.inviteExpiredRefused;
  return words.inviteDeadRefused;
}

/**
 * Uses a one-time token, found by its digest: sets the password (and name for invites) and marks the token
 * used. An unknown, used or expired token, or one of a deactivated account, is refused with its reason.
 */
export async function updatePasswordWithToken(p: { tokenHash: string; kind: "invite" | "password_reset"; passwordHash: string; name?: string; refusals?: LinkRefusalWords }) {
  return db.transaction(async (tx) => {
    const [found] = await tx
      .select({ id: userTokens.id, userId: userTokens.userId, expiresAt: userTokens.expiresAt, usedAt: userTokens.usedAt, passwordHash: users.passwordHash, active: users.active })
      .from(userTokens)
      .innerJoin(users, eq(users.id, userTokens.userId))
      .where(and(eq(userTokens.tokenHash, p.tokenHash), eq(userTokens.kind, p.kind)))
      .for("update");
    const row = found && { ...found, hasPassword: found.passwordHash !== null };
    if (!row || row.usedAt !== null || row.expiresAt.getTime() <= Date.now() || !row.active) throw new AppError("bad_request", linkRefusal(p.kind, row, p.refusals ?? ENGLISH_REFUSALS));
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

/** The active account with this e-mail, locked for the rest of the transaction, or null. */
export async function lockActiveAccountByEmail(tx: Tx, email: string) {
  const [user] = await tx
    .select({ id: users.id, name: users.name, locale: users.locale, passwordHash: users.passwordHash })
    .from(users)
    .where(and(eq(users.email, email), eq(users.active, true)))
    .for("update");
  if (!user) return null;
  return { id: user.id, name: user.name, locale: user.locale, hasPassword: user.passwordHash !== null };
}

/** Stores a reset token's digest and queues its mail; only the newest link works, earlier ones are voided. */
export async function insertPasswordReset(tx: Tx, p: { userId: number; tokenHash: string; expiresAt: Date; mail: OutgoingMail }) {
  await voidOpenTokens(tx, p.userId, "password_reset");
  await tx.insert(userTokens).values({ userId: p.userId, kind: "password_reset", tokenHash: p.tokenHash, expiresAt: p.expiresAt });
  await insertMail(tx, p.mail);
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

/** Records a successful sign-in, for the admin's user list. */
export async function updateLastSignIn(userId: number) {
  await db.update(users).set({ lastSignedInAt: new Date() }).where(eq(users.id, userId));
}

/** An account for an admin to change, locked for the rest of the transaction. */
export async function lockAccountForAdmin(tx: Tx, viewer: Viewer, userId: number) {
  if (viewer.role !== "admin") throw new AppError("forbidden", "Only an administrator can change accounts.");
  const [account] = await tx
    .select({ id: users.id, name: users.name, email: users.email, role: users.role, active: users.active, locale: users.locale, passwordHash: users.passwordHash })
    .from(users)
    .where(eq(users.id, userId))
    .for("update");
  if (!account) throw new AppError("not_found", "That account no longer exists.");
  const { passwordHash, ...rest } = account;
  return { ...rest, hasPassword: passwordHash !== null };
}

/** The programs with these ids, by name; the caller compares the count to find unknown ids. */
export async function listProgramsById(tx: Tx, programIds: number[]) {
  if (programIds.length === 0) return [];
  return tx.select({ id: programs.id, name: programs.name }).from(programs).where(inArray(programs.id, programIds)).orderBy(asc(programs.name));
}

/** The names of the programs a coordinator runs. */
export async function listCoordinatorProgramNames(tx: Tx, userId: number) {
  const rows = await tx
    .select({ name: programs.name })
    .from(programCoordinators)
    .innerJoin(programs, eq(programs.id, programCoordinators.programId))
    .where(eq(programCoordinators.userId, userId))
    .orderBy(asc(programs.name));
  return rows.map((r) => r.name);
}

/**
 * Stores a staff invitation: a new account without a password in the given role, its programs (for a
 * coordinator), the token's digest, its mail and an audit entry.
 */
export async function insertStaffInvitation(
  tx: Tx,
  p: { viewer: Viewer; name: string; email: string; role: "coordinator" | "admin"; programIds: number[]; tokenHash: string; expiresAt: Date; mail: OutgoingMail },
): Promise<number> {
  let userId: number;
  try {
    const [inserted] = await tx.insert(users).values({ email: p.email, name: p.name, role: p.role }).$returningId();
    userId = inserted!.id;
  } catch (e) {
    // Another invitation to the same e-mail committed a moment before this one.
    if (isDuplicateKey(e)) throw new AppError("conflict", "This e-mail already has an invitation. Use Resend in the list above to send a new link.", { email: ["This e-mail already has an invitation."] });
    throw e;
  }
  if (p.programIds.length > 0) await tx.insert(programCoordinators).values(p.programIds.map((programId) => ({ programId, userId })));
  await tx.insert(userTokens).values({ userId, kind: "invite", tokenHash: p.tokenHash, expiresAt: p.expiresAt, createdById: p.viewer.id });
  await insertMail(tx, p.mail);
  await insertAudit(tx, { actorId: p.viewer.id, action: "invite_staff", entity: "user", entityId: userId, newValue: { email: p.email, role: p.role, programIds: p.programIds } });
  return userId;
}

/** A fresh invitation link for someone who has not set a password yet; their earlier links stop working. */
export async function insertInvitationLink(tx: Tx, p: { viewer: Viewer; userId: number; tokenHash: string; expiresAt: Date; mail: OutgoingMail }) {
  await voidOpenTokens(tx, p.userId, "invite");
  await tx.insert(userTokens).values({ userId: p.userId, kind: "invite", tokenHash: p.tokenHash, expiresAt: p.expiresAt, createdById: p.viewer.id });
  await insertMail(tx, p.mail);
  await insertAudit(tx, { actorId: p.viewer.id, action: "resend_invite", entity: "user", entityId: p.userId });
}

/** Stops a person's open invitation links, with an audit entry. */
export async function voidInvitation(tx: Tx, p: { viewer: Viewer; userId: number }) {
  await voidOpenTokens(tx, p.userId, "invite");
  await insertAudit(tx, { actorId: p.viewer.id, action: "cancel_invite", entity: "user", entityId: p.userId });
}

/** Sets the programs a coordinator runs to exactly these, with an audit entry of before and after. */
export async function replaceCoordinatorPrograms(tx: Tx, p: { viewer: Viewer; userId: number; programIds: number[] }) {
  const before = await tx.select({ id: programCoordinators.programId }).from(programCoordinators).where(eq(programCoordinators.userId, p.userId));
  await tx.delete(programCoordinators).where(eq(programCoordinators.userId, p.userId));
  if (p.programIds.length > 0) await tx.insert(programCoordinators).values(p.programIds.map((programId) => ({ programId, userId: p.userId })));
  await insertAudit(tx, {
    actorId: p.viewer.id,
    action: "assign_programs",
    entity: "user",
    entityId: p.userId,
    oldValue: { programIds: before.map((r) => r.id).sort((a, b) => a - b) },
    newValue: { programIds: [...p.programIds].sort((a, b) => a - b) },
  });
}

/** Sets the language of one person's own screens, mails and printouts (the caller passes the viewer's own id). */
export async function updateUserLocale(p: { userId: number; locale: Locale }) {
  await db.transaction(async (tx) => {
    const [user] = await tx.select({ locale: users.locale }).from(users).where(eq(users.id, p.userId)).for("update");
    if (!user) throw new AppError("not_found", "That account no longer exists.");
    await tx.update(users).set({ locale: p.locale }).where(eq(users.id, p.userId));
    await insertAudit(tx, { actorId: p.userId, action: "change_language", entity: "user", entityId: p.userId, oldValue: { locale: user.locale }, newValue: { locale: p.locale } });
  });
}
