import { z } from "zod";
import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { idParam } from "@/lib/validation/common";
import { parseAnalysisQuery } from "@/lib/validation/analysis";
import { prepareAnalysis, viewAnalysis } from "@/server/analysis/load-analysis";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam });

/**
 * One trait's analysis as JSON: all sites for staff of the trial's program, a cooperator's own sites
 * once a coordinator has shared them (blind codes only until the trial is published, see lib/domain/analysis/blind). The ETag changes whenever the
 * trial's data, reviews or exclusions change, so a repeat request with If-None-Match gets a 304.
 * Plot rows are left out unless `plots=1` asks for them: the page does not show them and they are
 * most of the body on a big trial (the exports carry them too).
 */
export async function GET(request: Request, context: { params: Promise<{ trialId: string }> }) {
  try {
    const viewer = await assertRole("coordinator", "admin", "cooperator");
    const params = paramsSchema.safeParse(await context.params);
    if (!params.success) throw new AppError("not_found", "That trial does not exist.");
    const query = parseAnalysisQuery(new URL(request.url).searchParams);
    if (!query.ok) throw new AppError("bad_request", query.message);
    const prepared = await prepareAnalysis(viewer, params.data.trialId, query.data);
    if (!prepared) throw new AppError("not_found", "That trial does not exist, or its results have not been shared with you.");
    const headers = { ETag: prepared.etag, "Cache-Control": "private, no-cache", Vary: "Cookie" };
    const match = request.headers.get("if-none-match");
    if (match && match.split(",").some((t) => t.trim() === prepared.etag)) return new Response(null, { status: 304, headers });
    const view = await viewAnalysis(viewer, params.data.trialId, prepared, query.data.plots ?? false);
    if (!view) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
    return Response.json(view, { headers });
  } catch (e) {
    return toResponse(e);
  }
}
