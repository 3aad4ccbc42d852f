import { z } from "zod";
import { requirePublishedReport } from "@/server/publish/public-snapshots";
import { openDataJson } from "@/server/open-data/answers";
import { defineRoute } from "@/server/http/define-route";
import { apiTrial } from "@/lib/domain/publish/open-data";

/** One published trial (latest version, or ?version=N): sites, traits and entries. */
export const GET = defineRoute({ roles: "public", params: { schema: z.object({ code: z.string() }) } }, async ({ params, request }) => {
  const { snapshot, latestVersion } = await requirePublishedReport(params.code, request);
  return openDataJson(apiTrial(snapshot, latestVersion));
});
