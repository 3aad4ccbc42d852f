import { defineRoute } from "@/server/http/define-route";
import { readServiceWorker } from "@/server/offline/service-worker";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The service worker that keeps the recording pages for use without a signal (lib/domain/offline.ts). */
export const GET = defineRoute({ roles: "public" }, async () => {
  const script = await readServiceWorker();
  if (!script) return new Response("Offline use is not built into this server.", { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  // Checked on every visit, so a new build's worker replaces the old one at once.
  return new Response(new Uint8Array(script), { headers: { "Content-Type": "text/javascript; charset=utf-8", "Cache-Control": "no-cache" } });
});
