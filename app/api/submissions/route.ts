import { AppError } from "@/lib/errors";
import { siteParamsSchema } from "@/lib/validation/observations";
import { getSubmissionState } from "@/db/queries/review";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** Review state of one site's data (`?trialId=&siteId=`): the site's growers and the trial's staff only. */
export const GET = defineRoute(
  { roles: "signed-in", query: { schema: siteParamsSchema, refuse: "not_found", message: "That site or trial does not exist." } },
  async ({ viewer, query }) => {
    const state = await getSubmissionState(viewer, query);
    if (!state) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
    return Response.json(state, { headers: { "Cache-Control": "private, no-store" } });
  },
);
