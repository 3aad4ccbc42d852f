import { z } from "zod";
import { requirePublishedSnapshot } from "@/server/publish/public-snapshots";
import { openDataJson } from "@/server/open-data/answers";
import { defineRoute } from "@/server/http/define-route";
import { apiResults } from "@/lib/domain/publish/open-data";

/** A published trial's per-trait results: every entry's mean, SE, plots, rank, group letters and % of check. */
export const GET = defineRoute({ roles: "public", params: { schema: z.object({ code: z.string() }) } }, async ({ params, request }) =>
  openDataJson(apiResults(await requirePublishedSnapshot(params.code, request))),
);
