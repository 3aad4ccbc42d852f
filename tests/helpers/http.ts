import { baseUrl } from "./browser";

/** A signed-in session for plain fetch calls: the cookie header to send and what sign-in set. */
export interface HttpSession {
  cookie: string;
  setCookies: string[];
}

function mergeCookies(into: Map<string, string>, setCookies: string[]) {
  for (const c of setCookies) {
    const pair = c.split(";", 1)[0]!;
    const eq = pair.indexOf("=");
    into.set(pair.slice(0, eq), pair.slice(eq + 1));
  }
}

const cookieHeader = (jar: Map<string, string>) => [...jar.entries()].map(([k, v]) => `${k}=${v}`).join("; ");

/**
 * Signs in through next-auth's credentials endpoint, as the sign-in form does, with extra `headers` on
 * both requests. Every call comes from 127.0.0.1; a test whose failures must not count against that
 * address signs in from one of its own (helpers/from-address.ts). Answers the raw callback response too,
 * for tests about refusals. `base` is another server's address (default: the suite's server).
 */
export async function credentialsSignIn(email: string, password: string, headers: Record<string, string> = {}, base: string = baseUrl) {
  const jar = new Map<string, string>();
  const csrf = await fetch(new URL("/api/auth/csrf", base), { headers });
  mergeCookies(jar, csrf.headers.getSetCookie());
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(new URL("/api/auth/callback/credentials", base), {
    method: "POST",
    redirect: "manual",
    headers: { ...headers, "Content-Type": "application/x-www-form-urlencoded", Cookie: cookieHeader(jar) },
    body: new URLSearchParams({ email, password, csrfToken, json: "true" }).toString(),
  });
  const setCookies = response.headers.getSetCookie();
  mergeCookies(jar, setCookies);
  const body = response.headers.get("content-type")?.includes("json") ? ((await response.json()) as { url?: string }) : { url: response.headers.get("location") ?? undefined };
  const signedIn = [...jar.keys()].some((k) => k.endsWith("next-auth.session-token"));
  return { response, body, signedIn, session: { cookie: cookieHeader(jar), setCookies } satisfies HttpSession };
}

/** Signs in with a known-good password and fails loudly otherwise (a wrong password would count toward the throttle). */
export async function httpSession(email: string, password: string): Promise<HttpSession> {
  const result = await credentialsSignIn(email, password);
  if (!result.signedIn) throw new Error(`sign-in failed for ${email}: ${result.response.status} ${JSON.stringify(result.body)}`);
  return result.session;
}

/** A request to the test server that never follows redirects, so a redirect is an answer of its own. */
export function request(path: string, session: HttpSession | null, init: RequestInit = {}) {
  const headers = new Headers(init.headers);
  if (session) headers.set("Cookie", session.cookie);
  return fetch(new URL(path, baseUrl), { ...init, headers, redirect: "manual" });
}
