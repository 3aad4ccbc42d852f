import type { NextConfig } from "next";
import createNextIntlPlugin from "next-intl/plugin";
import { BODY_LIMITS, PROXY_BODY_COPY_BYTES } from "./lib/domain/request-limits";

const securityHeaders = [
  { key: "X-Frame-Options", value: "DENY" },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "Permissions-Policy", value: "camera=(self), geolocation=(), microphone=()" },
];

const nextConfig: NextConfig = {
  // Test runs build into their own folder so they never replace the build a running server uses.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  serverExternalPackages: ["@aws-sdk/client-s3", "mysql2", "exceljs", "smtp-server", "mailparser"],
  experimental: {
    // Server actions read their body within this limit as it streams in (lib/domain/request-limits.ts).
    serverActions: { bodySizeLimit: BODY_LIMITS.pageForm.bytes },
    // The copy of a page request's body Next makes for proxy.ts, which refuses anything over the page limit.
    proxyClientMaxBodySize: PROXY_BODY_COPY_BYTES,
  },
  // The first, unversioned open data addresses move permanently to /api/public/v1 (query kept). Next's router
  // answers them before proxy.ts, as cheaply as a static file; a malformed code falls through to the route
  // handlers in app/api/public/trials, which refuse it with a 404.
  async redirects() {
    return [
      { source: "/api/public/trials", destination: "/api/public/v1/trials", permanent: true },
      { source: "/api/public/trials/:code([A-Za-z0-9-]{1,40})", destination: "/api/public/v1/trials/:code", permanent: true },
    ];
  },
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      // next-auth's routes skip proxy.ts (they read their own body) and its error page is HTML: nothing may run.
      { source: "/api/auth/:path*", headers: [{ key: "Content-Security-Policy", value: "default-src 'none'; style-src 'unsafe-inline'; img-src 'self'; form-action 'self'; base-uri 'none'; frame-ancestors 'none'" }] },
    ];
  },
};

// next-intl reads each request's language and catalogue here (profile in the portal, ?lang= on public pages).
const withNextIntl = createNextIntlPlugin("./server/i18n/request.ts");

export default withNextIntl(nextConfig);
