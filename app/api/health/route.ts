import { checkHealth } from "@/server/health";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** For load balancers: 200 when this instance can serve (database and storage reachable), 503 otherwise. */
export const GET = defineRoute({ roles: "public" }, async () => {
  const health = await checkHealth();
  return Response.json(health, { status: health.status === "ok" ? 200 : 503, headers: { "Cache-Control": "no-store" } });
});
