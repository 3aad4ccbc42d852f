import { NextRequest } from "next/server";
import { authHandler } from "@/server/auth";
import { defineRoute } from "@/server/http/define-route";

type AuthContext = { params: Promise<{ nextauth: string[] }> };

export { authHandler as GET };

/**
 * next-auth reads the whole body of a sign-in or sign-out itself, so it gets a copy read here first,
 * within the auth limit and only from Seedplot's own pages.
 */
export const POST = defineRoute({ roles: "public", body: { kind: "auth", as: "short-form" } }, async ({ request, context, body }) => {
  return await authHandler(new NextRequest(request.url, { method: "POST", headers: request.headers, body }), context as AuthContext);
});
