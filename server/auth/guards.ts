import "server-only";
import { cache } from "react";
import { cookies } from "next/headers";
import { decode, getToken } from "next-auth/jwt";
import { redirect } from "next/navigation";
import { env } from "@/lib/env";
import { getActiveViewer } from "@/db/queries/users";
import { BoundedStore } from "@/lib/domain/cache/bounded-store";
import { AppError } from "@/lib/errors";
import type { Role } from "@/lib/domain/vocabulary/enums";
import type { Viewer } from "@/lib/domain/viewer";

/**
 * The signed-in, still-active viewer, or null. Reads the session cookie and checks, in the one query
 * that loads the account, that the session was not ended since it was issued (sign-out, new password,
 * deactivation). A database outage surfaces as an error, not as a signed-out visitor. Memoised per request.
 */
export const getViewer = cache(async (): Promise<Viewer | null> => {
  // The same cookie and secret next-auth uses; headers are left out so only the cookie can carry a session.
  const token = await getToken({ req: { cookies: await cookies(), headers: {} } as unknown as Parameters<typeof getToken>[0]["req"], secret: env.NEXTAUTH_SECRET, raw: true });
  const session = token ? await decodeSession(token) : null;
  if (!session) return null;
  return getActiveViewer(session.uid, session.gen);
});

interface DecodedSession {
  uid: number;
  gen: number;
  /** when the cookie's own expiry passes (ms) */
  expiresAt: number;
  bytes: number;
}

/**
 * Session cookies already decoded, by their exact text. Decoding one (a key derivation and a decryption) was a
 * twentieth of the server's work per save, and a grower's phone sends the same cookie with every save. Only
 * what the cookie itself says is kept (who, which session generation, until when), which never changes for
 * the same text; whether that session still counts (signed out, new password, deactivated) and the person's
 * role are read from the database on every request by getActiveViewer, so keeping the decoding grants nothing
 * the database has since taken away. Only cookies that decoded are kept, so made-up ones cannot fill it.
 */
const decodedSessions = new BoundedStore<DecodedSession>(5_000, 8 * 1024 * 1024);

async function decodeSession(token: string): Promise<{ uid: number; gen: number } | null> {
  const known = decodedSessions.get(token);
  if (known && known.expiresAt > Date.now()) return known;
  // As getToken decodes: anything that does not decrypt, or is past its expiry, is no session.
  const payload = await decode({ token, secret: env.NEXTAUTH_SECRET }).catch(() => null);
  if (typeof payload?.uid !== "number" || typeof payload.gen !== "number") return null;
  if (typeof payload.exp === "number") decodedSessions.set(token, { uid: payload.uid, gen: payload.gen, expiresAt: payload.exp * 1000, bytes: token.length });
  return { uid: payload.uid, gen: payload.gen };
}

/** For pages: the viewer, or a redirect to sign-in. */
export async function requireUser(): Promise<Viewer> {
  const viewer = await getViewer();
  if (!viewer) redirect("/sign-in");
  return viewer;
}

/** For pages: a viewer with one of the roles; others see the 403 page. */
export async function requireRole(...roles: Role[]): Promise<Viewer> {
  const viewer = await requireUser();
  if (!roles.includes(viewer.role)) redirect("/portal/forbidden");
  return viewer;
}

/** For route handlers and actions: throws an AppError instead of redirecting. */
export async function assertRole(...roles: Role[]): Promise<Viewer> {
  const viewer = await getViewer();
  if (!viewer) throw new AppError("unauthenticated", "Please sign in first.");
  if (roles.length > 0 && !roles.includes(viewer.role)) throw new AppError("forbidden", "Your account does not have access to this.");
  return viewer;
}
