import { NextResponse, type NextRequest } from "next/server";
import { getToken } from "next-auth/jwt";
import { env } from "@/lib/env";
import { isAppError } from "@/lib/errors";
import { readBodyWithin } from "@/server/http/body";
import { assertOwnOrigin } from "@/server/http/origin";
import { contentSecurityPolicy, newNonce } from "@/server/http/content-security-policy";
import { answerFromPublicCache } from "@/server/publish/public-cache";
import { addressLocale, LANGUAGE_HEADER, LANGUAGE_PARAM, languageFromAddress } from "@/lib/domain/i18n/language-choice";

function isDecodable(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return true;
  } catch {
    return false;
  }
}

const plainText = (message: string, status: number) => new NextResponse(message, { status, headers: { "content-type": "text/plain; charset=utf-8" } });

/**
 * Anything but GET and HEAD that reaches the proxy goes to a page (server actions) or to a route that takes
 * no body: it must come from Seedplot's own pages (Next would answer a foreign server action with a 500)
 * and stay within the page-form limit. Next hands the proxy its own copy of the body, cut at
 * PROXY_BODY_COPY_BYTES; counting it finds bodies over the limit with or without a declared length. Next
 * answers only once the client has sent the whole body, reading and dropping what is past the copy.
 */
async function refuseWrite(request: NextRequest): Promise<NextResponse | null> {
  if (request.method === "GET" || request.method === "HEAD") return null;
  try {
    assertOwnOrigin(request);
    await readBodyWithin(request, "pageForm");
    return null;
  } catch (e) {
    if (!isAppError(e)) throw e;
    return plainText(e.message, e.status);
  }
}

/**
 * Runs before every page and every route except those that read a body themselves (see config): refuses
 * undecodable paths with a 400 (Next would answer 500), refuses foreign or oversized writes, redirects
 * signed-out visitors away from /portal early (a convenience only: every page, action and route still
 * checks the viewer and role itself through server/auth/guards), answers anonymous public requests from
 * the public cache (server/publish/public-cache.ts), and sets the CSP with a nonce of its own on every answer.
 */
export default async function proxy(request: NextRequest) {
  const { pathname, search } = request.nextUrl;
  if (!isDecodable(pathname)) return plainText("That address is not valid.", 400);
  const refused = await refuseWrite(request);
  if (refused) return refused;
  if (pathname === "/portal" || pathname.startsWith("/portal/")) {
    const token = await getToken({ req: request, secret: env.NEXTAUTH_SECRET });
    if (!token) {
      const signIn = new URL("/sign-in", request.url);
      signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
      // A link from a Spanish mail (/portal?lang=es) lands on a Spanish sign-in page.
      if (addressLocale(request.nextUrl.searchParams) !== "en") signIn.searchParams.set(LANGUAGE_PARAM, addressLocale(request.nextUrl.searchParams));
      return NextResponse.redirect(signIn);
    }
  }
  const cached = await answerFromPublicCache(request);
  if (cached) return cached;
  const nonce = newNonce();
  const policy = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", policy);
  // The language header is ours alone: a client's copy is dropped; public pages get the one their address asks for.
  headers.delete(LANGUAGE_HEADER);
  if (languageFromAddress(pathname)) headers.set(LANGUAGE_HEADER, addressLocale(request.nextUrl.searchParams));
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

export const config = {
  // Every request, whatever its headers, but static files and the routes that read a body (each checks its
  // origin and reads its body within its own limit through lib/http). Next copies a request's whole body
  // for the proxy and waits for its end before the route runs, so a route behind the proxy could neither
  // cut an oversized body off while it streams in nor hold less than the copy. Those routes are matched
  // only with plain ids and names, so an undecodable address still reaches the proxy and gets its 400.
  matcher: ["/((?!_next/static|_next/image|favicon.ico|fonts/|api/(?:photos|observations|record/\\d+/\\d+/upload|auth/[a-z_]+(?:/[a-z_]+)?)$).*)"],
};
