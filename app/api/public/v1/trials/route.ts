import { z } from "zod";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { openDataJson } from "@/server/open-data/answers";
import { defineRoute } from "@/server/http/define-route";
import { apiTrialIndex } from "@/lib/domain/publish/open-data";

const filtersSchema = z.object({
  q: z.string().max(100).optional(),
  crop: z.string().max(100).optional(),
  season: z.string().max(100).optional(),
});

/** Published trials, the latest version of each (the same list as the public index). */
export const GET = defineRoute({ roles: "public", query: { schema: filtersSchema, message: "Search terms must be under 100 characters." } }, async ({ query }) =>
  openDataJson(apiTrialIndex(await listPublicTrials(query))),
);
