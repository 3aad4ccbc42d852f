import "server-only";
import { cache } from "react";
import { cookies } from "next/headers";
import { getToken } from "next-auth/jwt";
import { redirect } from "next/navigation";
import { env } from "@/lib/env";
import { getActiveViewer } from "@/db/queries/users";
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
  const token = await getToken({ req: { cookies: await cookies(), headers: {} } as unknown as Parameters<typeof getToken>[0]["req"], secret: env.NEXTAUTH_SECRET });
  if (typeof token?.uid !== "number" || typeof token.gen !== "number") return null;
  return getActiveViewer(token.uid, token.gen);
});

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
