import { NextResponse } from "next/server";
import { withAuth } from "next-auth/middleware";
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

// Signed-out visitors to /portal are redirected early; this is only a convenience, every page,
// action and route still checks the viewer and role itself through lib/auth/guards.
export default withAuth(
  function proxy(request) {
    const nonce = Buffer.from(crypto.randomUUID()).toString("base64");
    const policy = contentSecurityPolicy(nonce);
    const headers = new Headers(request.headers);
    headers.set("x-nonce", nonce);
    headers.set("content-security-policy", policy);
    const response = NextResponse.next({ request: { headers } });
    response.headers.set("Content-Security-Policy", policy);
    return response;
  },
  {
    pages: { signIn: "/sign-in" },
    secret: env.NEXTAUTH_SECRET,
    callbacks: { authorized: ({ token, req }) => (req.nextUrl.pathname.startsWith("/portal") ? token !== null : true) },
  },
);

export const config = {
  // Everything but static files, so every page gets its policy.
  matcher: [{ source: "/((?!_next/static|_next/image|favicon.ico|fonts/).*)", missing: [{ type: "header", key: "next-router-prefetch" }] }],
};
