import { z } from "zod";
import { AppError } from "@/lib/errors";
import { analysisQueryOf, versionedAnswer } from "@/server/analysis/http";
import { idParam } from "@/lib/validation/common";
import { defineRoute } from "@/server/http/define-route";
import { loadSiteSection } from "@/server/analysis/load-analysis";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam, siteId: idParam });

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
    const { headers, notModified } = versionedAnswer(request, loaded.etag);
    if (notModified) return notModified;
    return Response.json(loaded.section, { headers });
  },
);
