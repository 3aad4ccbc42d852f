import "server-only";
import { and, asc, count, eq, gt, isNull, sql } from "drizzle-orm";
import { db } from "../index";
import { siteCooperators, sites, users, userTokens } from "../schema";
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
  const [row] = await db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role })
    .from(users)
    .where(and(eq(users.id, userId), eq(users.active, true), eq(users.sessionGeneration, sessionGeneration)))
    .limit(1);
  return row ?? null;
}

/** Every account with its role, for the admin's user list (admin only; checked by the caller). */
export async function listUsersForAdmin(viewer: Viewer) {
  if (viewer.role !== "admin") return [];
  return db
    .select({ id: users.id, email: users.email, name: users.name, role: users.role, active: users.active, hasPassword: users.passwordHash, createdAt: users.createdAt })
    .from(users)
    .orderBy(asc(users.role), asc(users.name))
    .then((rows) => rows.map(({ hasPassword, ...r }) => ({ ...r, invited: hasPassword === null })));
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
