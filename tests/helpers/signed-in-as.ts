// Stand-in for server/auth/guards in integration tests that call route handlers directly: there is no
// request session, so a test sets `testAuth.viewer` and the handlers' guards read it. Use it with
//   vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";

export const testAuth: { viewer: Viewer | null } = { viewer: null };

export async function getViewer(): Promise<Viewer | null> {
  return testAuth.viewer;
}

export async function assertRole(...roles: string[]): Promise<Viewer> {
  if (!testAuth.viewer) throw new AppError("unauthenticated", "Please sign in first.");
  if (roles.length > 0 && !roles.includes(testAuth.viewer.role)) throw new AppError("forbidden", "Your account does not have access to this.");
  return testAuth.viewer;
}
