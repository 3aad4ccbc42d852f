// Requests to the test server from a chosen loopback address (Linux routes all of 127.0.0.0/8 to the
// machine), so a test can be a client of its own: per-address limits key on the connection's address,
// and every other test connects from 127.0.0.1.
import http from "node:http";
import { baseUrl } from "./browser";

/** A fresh address in 127.0.0.0/8 other than 127.0.0.1, different on every call. */
export function spareLoopbackAddress(): string {
  const byte = () => Math.floor(Math.random() * 254) + 1;
  return `127.${100 + Math.floor(Math.random() * 150)}.${byte()}.${byte()}`;
}

/** A made-up public-looking address, for forged headers. */
export function madeUpAddress(): string {
  const byte = () => Math.floor(Math.random() * 254) + 1;
  return `198.51.${byte()}.${byte()}`;
}

export interface RawResponse {
  status: number;
  headers: http.IncomingHttpHeaders;
  text: string;
}

/** One HTTP request from `localAddress` to the server at `base`; never follows redirects. */
export function requestFrom(
  localAddress: string,
  path: string,
  init: { method?: string; headers?: Record<string, string>; body?: string } = {},
  base: string = baseUrl,
): Promise<RawResponse> {
  const target = new URL(path, base);
  return new Promise((resolve, reject) => {
    const req = http.request(
      {
        host: "127.0.0.1",
        port: target.port,
        path: `${target.pathname}${target.search}`,
        method: init.method ?? "GET",
        localAddress,
        headers: { Host: target.host, ...init.headers },
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, text: Buffer.concat(chunks).toString("utf8") }));
        res.on("error", reject);
      },
    );
    req.on("error", reject);
    req.end(init.body);
  });
}

const cookiePairs = (setCookie: string[] | undefined) => (setCookie ?? []).map((c) => c.split(";", 1)[0]!);

/**
 * Signs in through next-auth's credentials endpoint from `localAddress`, sending `headers` (such as a
 * forged X-Forwarded-For) with both requests. Answers whether a session was set (and its cookie) and the error shown.
 */
export async function signInFrom(localAddress: string, email: string, password: string, headers: Record<string, string> = {}, base: string = baseUrl) {
  const csrf = await requestFrom(localAddress, "/api/auth/csrf", { headers }, base);
  const { csrfToken } = JSON.parse(csrf.text) as { csrfToken: string };
  const response = await requestFrom(
    localAddress,
    "/api/auth/callback/credentials",
    {
      method: "POST",
      headers: { ...headers, "Content-Type": "application/x-www-form-urlencoded", Cookie: cookiePairs(csrf.headers["set-cookie"]).join("; ") },
      body: new URLSearchParams({ email, password, csrfToken, json: "true" }).toString(),
    },
    base,
  );
  const session = cookiePairs(response.headers["set-cookie"]).filter((c) => c.split("=", 1)[0]!.endsWith("next-auth.session-token"));
  const url = response.headers["content-type"]?.includes("json") ? (JSON.parse(response.text) as { url?: string }).url : response.headers.location;
  return { signedIn: session.length > 0, cookie: session.join("; "), error: new URL(url ?? "http://x/").searchParams.get("error") };
}
