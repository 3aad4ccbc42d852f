import { NextResponse, type NextRequest } from "next/server";
import { getToken } from "next-auth/jwt";
import { env } from "@/lib/env";

// A per-request nonce lets Next's own inline scripts run while any injected script is refused.
function contentSecurityPolicy(nonce: string): string {
  const dev = env.NODE_ENV === "development";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    // Charts and React set style attributes; styles cannot run code.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

function isDecodable(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return true;
  } catch {
    return false;
  }
}

/**
 * Runs before every page and route: refuses undecodable paths with a 400 (Next would answer 500),
 * redirects signed-out visitors away from /portal early (a convenience only: every page, action and
 * route still checks the viewer and role itself through lib/auth/guards), and sets the CSP.
 */
export default async function proxy(request: NextRequest) {
  const { pathname, search } = request.nextUrl;
  if (!isDecodable(pathname)) {
    return new NextResponse("That address is not valid.", { status: 400, headers: { "content-type": "text/plain; charset=utf-8" } });
  }
  if (pathname === "/portal" || pathname.startsWith("/portal/")) {
    const token = await getToken({ req: request, secret: env.NEXTAUTH_SECRET });
    if (!token) {
      const signIn = new URL("/sign-in", request.url);
      signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
      return NextResponse.redirect(signIn);
    }
  }
  const nonce = Buffer.from(crypto.randomUUID()).toString("base64");
  const policy = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

export const config = {
  // Everything but static files, so every page gets its policy.
  matcher: [{ source: "/((?!_next/static|_next/image|favicon.ico|fonts/).*)", missing: [{ type: "header", key: "next-router-prefetch" }] }],
};
