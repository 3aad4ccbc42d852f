import "server-only";
import { and, asc, count, desc, eq, gt, isNull, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { db } from "../index";
import { auditLog, programCoordinators, programs, siteCooperators, sites, users, userTokens } from "../schema";
import type { TokenKind } from "@/lib/domain/vocabulary/enums";
import { staffSiteScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

/** Credentials row for the sign-in check only; the hash never leaves the auth module. */
export async function getSignInRecord(email: string) {
  const [row] = await db
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      passwordHash: users.passwordHash,
      active: users.active,
      sessionGeneration: users.sessionGeneration,
    })
    .from(users)
    .where(eq(users.email, email))
    .limit(1);
  return row ?? null;
}

/**
 * The current, active account behind a session (roles can change after sign-in), or null when the
 * session was ended: issued before the account's last sign-out, password change or deactivation.
 */
export async function getActiveViewer(userId: number, sessionGeneration: number): Promise<Viewer | null> {
  const [row] = await activeViewerQuery.execute({ userId, sessionGeneration });
  return row ?? null;
}

// Run for every signed-in request, so its SQL is built once, not on each call.
const activeViewerQuery = db
  .select({ id: users.id, email: users.email, name: users.name, role: users.role, locale: users.locale })
  .from(users)
  .where(and(eq(users.id, sql.placeholder("userId")), eq(users.active, true), eq(users.sessionGeneration, sql.placeholder("sessionGeneration"))))
  .limit(1)
  .prepare();

/**
 * Every account for the admin's user list (admin only): role, the programs a coordinator runs, the last
 * sign-in, and the newest invitation link (the page works out its state).
 */
export async function listUsersForAdmin(viewer: Viewer) {
  if (viewer.role !== "admin") return [];
  const [accounts, programRows, links] = await Promise.all([
    db
      .select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active, passwordHash: users.passwordHash, lastSignedInAt: users.lastSignedInAt, createdAt: users.createdAt })
      .from(users)
      .orderBy(asc(users.role), asc(users.name)),
    db
      .select({ userId: programCoordinators.userId, id: programs.id, name: programs.name })
      .from(programCoordinators)
      .innerJoin(programs, eq(programs.id, programCoordinators.programId))
      .orderBy(asc(programs.name)),
    db
      .select({ userId: userTokens.userId, usedAt: userTokens.usedAt, expiresAt: userTokens.expiresAt })
      .from(userTokens)
      .where(eq(userTokens.kind, "invite"))
      .orderBy(desc(userTokens.createdAt), desc(userTokens.id)),
  ]);
  const newestLink = new Map<number, { usedAt: Date | null; expiresAt: Date }>();
  for (const l of links) if (!newestLink.has(l.userId)) newestLink.set(l.userId, { usedAt: l.usedAt, expiresAt: l.expiresAt });
  return accounts.map(({ passwordHash, ...a }) => ({
    ...a,
    hasPassword: passwordHash !== null,
    programs: programRows.filter((p) => p.userId === a.id).map((p) => ({ id: p.id, name: p.name })),
    newestInvitation: newestLink.get(a.id) ?? null,
  }));
}

/** An invitation link found by its digest, whatever its state, with its account and who sent it; for the invitation page. */
export async function getInvitationLink(tokenHash: string) {
  const inviter = alias(users, "inviter");
  const [row] = await db
    .select({
      usedAt: userTokens.usedAt,
      expiresAt: userTokens.expiresAt,
      email: users.email,
      name: users.name,
      role: users.role,
      active: users.active,
      passwordHash: users.passwordHash,
      inviterName: inviter.name,
    })
    .from(userTokens)
    .innerJoin(users, eq(users.id, userTokens.userId))
    .leftJoin(inviter, eq(inviter.id, userTokens.createdById))
    .where(and(eq(userTokens.tokenHash, tokenHash), eq(userTokens.kind, "invite")))
    .limit(1);
  if (!row) return null;
  const { passwordHash, ...rest } = row;
  return { ...rest, hasPassword: passwordHash !== null };
}

/**
 * Whom a deactivated person should ask: the administrator who deactivated the account, while still an
 * active administrator, or else the longest-standing active administrator.
 */
export async function getDeactivationContact(userId: number): Promise<{ name: string; email: string } | null> {
  const activeAdmin = and(eq(users.role, "admin"), eq(users.active, true));
  const [deactivatedBy] = await db
    .select({ name: users.name, email: users.email })
    .from(auditLog)
    .innerJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.entity, "user"), eq(auditLog.entityId, String(userId)), eq(auditLog.action, "deactivate"), activeAdmin))
    .orderBy(desc(auditLog.at), desc(auditLog.id))
    .limit(1);
  if (deactivatedBy) return deactivatedBy;
  const [anyAdmin] = await db.select({ name: users.name, email: users.email }).from(users).where(activeAdmin).orderBy(asc(users.id)).limit(1);
  return anyAdmin ?? null;
}

/** Counts accounts by role, for the admin's overview. */
export async function countUsersByRole(viewer: Viewer) {
  if (viewer.role !== "admin") return [];
  return db.select({ role: users.role, total: count() }).from(users).groupBy(users.role);
}

/** An unused, unexpired token of the given kind, found by its digest, with the person it belongs to. */
export async function getValidToken(tokenHash: string, kind: TokenKind) {
  const [row] = await db
    .select({ tokenId: userTokens.id, userId: users.id, email: users.email, name: users.name })
    .from(userTokens)
    .innerJoin(users, eq(users.id, userTokens.userId))
    .where(
      and(
        eq(userTokens.tokenHash, tokenHash),
        eq(userTokens.kind, kind),
        isNull(userTokens.usedAt),
        gt(userTokens.expiresAt, new Date()),
        eq(users.active, true),
      ),
    )
    .limit(1);
  return row ?? null;
}

/**
 * Growers with their sites, for staff managing the network. A coordinator sees only growers linked to sites
 * of their programs, and only those sites; a grower's other programs stay invisible. Admins see everyone.
 */
export async function listCooperators(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  const rows = await db
    .select({ id: users.id, name: users.name, email: users.email, phone: users.phone, active: users.active, passwordHash: users.passwordHash, siteName: sites.name })
    .from(users)
    .leftJoin(siteCooperators, eq(siteCooperators.userId, users.id))
    .leftJoin(sites, eq(sites.id, siteCooperators.siteId))
    .where(and(eq(users.role, "cooperator"), viewer.role === "admin" ? sql`true` : staffSiteScope(viewer)))
    .orderBy(asc(users.name), asc(sites.name));
  const byId = new Map<number, { id: number; name: string; email: string; phone: string | null; active: boolean; invited: boolean; sites: string[] }>();
  for (const r of rows) {
    const existing = byId.get(r.id) ?? { id: r.id, name: r.name, email: r.email, phone: r.phone, active: r.active, invited: r.passwordHash === null, sites: [] };
    if (r.siteName) existing.sites.push(r.siteName);
    byId.set(r.id, existing);
  }
  return [...byId.values()];
}
