import { z } from "zod";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/validation/common";
import { parseAnalysisQuery } from "@/lib/validation/analysis";
import { defineRoute } from "@/server/http/define-route";
import { loadSiteSection } from "@/server/analysis/load-analysis";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam, siteId: idParam });

function analysisQueryOf(search: URLSearchParams) {
  const query = parseAnalysisQuery(search);
  if (!query.ok) throw new AppError("bad_request", query.message);
  return query.data;
}

/**
 * One site's section of the analysis page for the same settings as the page (its means with letters, its
 * ANOVA and its germination rows), fetched when the section is opened. The same gate as the page and the
 * JSON API: staff of the trial's program, or a grower for their own site once its results are shared, with
 * blind codes only until publication. Another trial's site, or a site outside the analysis, is not found.
 */
export const GET = defineRoute(
  {
    roles: ["coordinator", "admin", "cooperator"],
    params: { schema: paramsSchema, message: "That trial or site does not exist." },
    query: analysisQueryOf,
  },
  async ({ viewer, params, query, request }) => {
    const loaded = await loadSiteSection(viewer, params.trialId, params.siteId, query);
    if (!loaded) throw new AppError("not_found", "That site is not in this analysis, or its results have not been shared with you.");
    const headers = { ETag: loaded.etag, "Cache-Control": "private, no-cache", Vary: "Cookie" };
    const match = request.headers.get("if-none-match");
    if (match && match.split(",").some((t) => t.trim() === loaded.etag)) return new Response(null, { status: 304, headers });
    return Response.json(loaded.section, { headers });
  },
);
