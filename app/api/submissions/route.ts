import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { siteParamsSchema } from "@/lib/validation/observations";
import { getSubmissionState } from "@/db/queries/review";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** Review state of one site's data (`?trialId=&siteId=`): the site's growers and the trial's staff only. */
export async function GET(request: Request) {
  try {
    const viewer = await assertRole();
    const search = new URL(request.url).searchParams;
    const params = siteParamsSchema.safeParse({ trialId: search.get("trialId"), siteId: search.get("siteId") });
    if (!params.success) throw new AppError("not_found", "That site or trial does not exist.");
    const state = await getSubmissionState(viewer, params.data);
    if (!state) throw new AppError("not_found", "That site or trial does not exist, or it is not one of yours.");
    return Response.json(state, { headers: { "Cache-Control": "private, no-store" } });
  } catch (e) {
    return toResponse(e);
  }
}
