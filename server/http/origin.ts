import "server-only";
import { AppError } from "@/lib/errors";
import { env } from "@/lib/env";

export const CROSS_SITE_MESSAGE = "Seedplot refused this change because it was sent from another website. Open Seedplot itself and try again.";

const APP_ORIGIN = new URL(env.APP_URL).origin;

function originOf(url: string): string | null {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
}

/**
 * Whether a state-changing request was sent by Seedplot's own pages (APP_URL's origin), as far as a
 * browser tells. Browsers send Origin with every POST and every fetch that is not a GET, so it decides
 * whenever it is there; a foreign or "null" origin is refused. Without it, Sec-Fetch-Site (sent by every
 * current browser) must say same-origin, and without that, the Referer must be one of our pages. A
 * request with none of the three did not come from a page in a browser at all (curl, scripts), so it
 * carries only the credentials its sender chose to give it and is left to the role checks. The session
 * cookie is SameSite=Lax, so other sites' pages do not send it with a POST anyway; this check is what
 * stops a page on a sibling host (same site, other origin) and any cookie sent by hand with a forged page.
 */
export function isOwnOriginWrite(headers: Headers, ownOrigin: string = APP_ORIGIN): boolean {
  const origin = headers.get("origin");
  if (origin !== null) return origin === ownOrigin;
  const site = headers.get("sec-fetch-site");
  if (site !== null) return site === "same-origin";
  const referer = headers.get("referer");
  if (referer !== null) return originOf(referer) === ownOrigin;
  return true;
}

/** For route handlers that change something: a 403 unless the request came from Seedplot's own pages. */
export function assertOwnOrigin(request: Request): void {
  if (isOwnOriginWrite(request.headers)) return;
  // One line per refusal, so an operator whose APP_URL is not the address people use sees why writes fail.
  console.warn(`[http] refused ${request.method} ${new URL(request.url).pathname} from origin ${JSON.stringify((request.headers.get("origin") ?? request.headers.get("referer") ?? "").slice(0, 100))}; APP_URL is ${APP_ORIGIN}`);
  throw new AppError("forbidden", CROSS_SITE_MESSAGE);
}
