// Builds the service worker after `next build`: esbuild bundles app/sw.ts with Serwist, then Serwist's
// injectManifest puts the build's own scripts, styles and fonts (named by content hash) into its precache
// list. The result goes into the build folder (NEXT_DIST_DIR, default .next), so a test build never replaces
// the worker a running server hands out; app/sw.js/route.ts serves it at /sw.js.
import { build } from "esbuild";
import { injectManifest } from "@serwist/build";
import { mkdir, rm } from "node:fs/promises";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const distDir = path.resolve(root, process.env.NEXT_DIST_DIR || ".next");
const outDir = path.join(distDir, "service-worker");
const bundled = path.join(outDir, "sw.bundled.js");

await mkdir(outDir, { recursive: true });
await build({
  entryPoints: [path.join(root, "app/sw.ts")],
  bundle: true,
  format: "iife",
  target: "es2022",
  minify: true,
  outfile: bundled,
  alias: { "@": root },
  define: { "process.env.NODE_ENV": '"production"' },
  logLevel: "warning",
});
const { count, size, warnings } = await injectManifest({
  swSrc: bundled,
  swDest: path.join(outDir, "sw.js"),
  globDirectory: distDir,
  globPatterns: ["static/**/*.{js,css,woff2}"],
  modifyURLPrefix: { "static/": "/_next/static/" },
  // Build files carry their hash in their name: no revision query needed.
  dontCacheBustURLsMatching: /^\/_next\/static\//,
  maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
});
await rm(bundled);
for (const w of warnings) console.warn(w);
console.log(`Service worker: ${count} files precached (${Math.round(size / 1024)} KiB), ${path.relative(root, path.join(outDir, "sw.js"))}`);
