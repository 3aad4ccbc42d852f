import "server-only";
import { cache } from "react";
import { getServerSession } from "next-auth";
import { redirect } from "next/navigation";
import { authOptions } from "./config";
import { getActiveViewer } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import type { Role } from "@/db/schema/enums";
import type { Viewer } from "./types";

/** The signed-in, still-active viewer, or null. Memoised per request. */
export const getViewer = cache(async (): Promise<Viewer | null> => {
  const session = await getServerSession(authOptions);
  const uid = session?.user?.id;
  if (!uid) return null;
  return getActiveViewer(uid);
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
