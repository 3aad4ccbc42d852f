import { z } from "zod";
import { requirePublishedSnapshot } from "@/server/publish/public-snapshots";
import { openDataJson } from "@/server/open-data/answers";
import { defineRoute } from "@/server/http/define-route";
import { apiPlots } from "@/lib/domain/publish/open-data";

/** A published trial's plot data: each plot's value per trait, with missing reasons and seed counts. */
export const GET = defineRoute({ roles: "public", params: { schema: z.object({ code: z.string() }) } }, async ({ params, request }) =>
  openDataJson(apiPlots(await requirePublishedSnapshot(params.code, request))),
);
