import { z } from "zod";
import { requirePublishedSnapshot } from "@/server/publish/public-snapshots";
import { defineRoute } from "@/server/http/define-route";

/** One published version as JSON: summary, entries, sites' public descriptions, results and data. */
export const GET = defineRoute({ roles: "public", params: { schema: z.object({ code: z.string() }) } }, async ({ params, request }) => {
  const snapshot = await requirePublishedSnapshot(params.code, request);
  return Response.json(snapshot, { headers: { "Cache-Control": "public, max-age=60" } });
});
