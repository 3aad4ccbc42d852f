import "server-only";
import { env } from "@/lib/env";

/** A fresh nonce for one response: unpredictable, never repeated. */
export const newNonce = () => Buffer.from(crypto.randomUUID()).toString("base64");

/**
 * The policy of every page: a per-response nonce lets Next's own inline scripts run while any injected
 * script is refused. proxy.ts sets it on rendered pages and the public cache on the answers it keeps
 * (server/publish/public-cache.ts puts a fresh nonce into each copy it sends).
 */
export function contentSecurityPolicy(nonce: string): string {
  const dev = env.NODE_ENV === "development";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    // Charts and React set style attributes; styles cannot run code.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    // The service worker (/sw.js) and the web app manifest, both Seedplot's own.
    "worker-src 'self'",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}
