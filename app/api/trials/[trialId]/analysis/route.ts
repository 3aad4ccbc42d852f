import { z } from "zod";
import { AppError } from "@/lib/errors";
import { analysisQueryOf, versionedAnswer } from "@/server/analysis/http";
import { idParam } from "@/lib/validation/common";
import { defineRoute } from "@/server/http/define-route";
import { prepareAnalysis, viewAnalysis } from "@/server/analysis/load-analysis";
import { toPageView } from "@/lib/domain/analysis/page-view";
import { warmUpAnalysisInThisCopy } from "@/server/analysis/warm-up";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam });

// Compiles this bundle's copy of the analysis on a made-up trial when a production server loads the route
// (at start: instrumentation.ts asks it once); see server/analysis/warm-up.ts.
warmUpAnalysisInThisCopy();

/**
 * One trait's analysis as JSON: all sites for staff of the trial's program, a cooperator's own sites
 * once a coordinator has shared them (blind codes only until the trial is published, see lib/domain/analysis/blind). The ETag changes whenever the
 * trial's data, reviews or exclusions change, so a repeat request with If-None-Match gets a 304.
 * Plot rows are left out unless `plots=1` asks for them: the page does not show them and they are
 * most of the body on a big trial (the exports carry them too). `page=1` answers the analysis page's slim
 * first view instead (what the page refetches when a setting changes; each site's section comes from ./sites/[siteId]).
 */
export const GET = defineRoute(
  {
    roles: ["coordinator", "admin", "cooperator"],
    params: { schema: paramsSchema, message: "That trial does not exist." },
    query: analysisQueryOf,
  },
  async ({ viewer, params, query, request }) => {
    const prepared = await prepareAnalysis(viewer, params.trialId, query);
    if (!prepared) throw new AppError("not_found", "That trial does not exist, or its results have not been shared with you.");
    const { headers, notModified } = versionedAnswer(request, prepared.etag);
    if (notModified) return notModified;
    const view = await viewAnalysis(prepared, (query.plots ?? false) && !query.page);
    return Response.json(query.page ? toPageView(view) : view, { headers });
  },
);
