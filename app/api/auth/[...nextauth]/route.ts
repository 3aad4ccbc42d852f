import { NextRequest } from "next/server";
import { authHandler } from "@/server/auth";
import { toResponse } from "@/lib/errors";
import { closeUnreadBody, readShortFormWithin } from "@/server/http/body";
import { assertOwnOrigin } from "@/server/http/origin";

type AuthContext = { params: Promise<{ nextauth: string[] }> };

export { authHandler as GET };

/**
 * next-auth reads the whole body of a sign-in or sign-out itself, so it gets a copy read here first,
 * within the auth limit and only from Seedplot's own pages.
 */
export async function POST(request: NextRequest, context: AuthContext) {
  try {
    assertOwnOrigin(request);
    const body = await readShortFormWithin(request, "auth");
    return await authHandler(new NextRequest(request.url, { method: "POST", headers: request.headers, body }), context);
  } catch (e) {
    return closeUnreadBody(request, toResponse(e));
  }
}
