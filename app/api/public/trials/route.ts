import { z } from "zod";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { defineRoute } from "@/server/http/define-route";

const filtersSchema = z.object({
  q: z.string().max(100).optional(),
  crop: z.string().max(80).optional(),
  season: z.string().max(80).optional(),
});

/** Published trials as JSON (the same list as the public index). */
export const GET = defineRoute({ roles: "public", query: { schema: filtersSchema, message: "Search terms must be under 100 characters." } }, async ({ query }) => {
  const { trials } = await listPublicTrials(query);
  return Response.json({ trials });
});
