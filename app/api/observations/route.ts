import { defineRoute } from "@/server/http/define-route";
import { getRecordingSheetForApi, saveObservationsForViewer } from "@/server/observations/recording";
import { StaleValuesError } from "@/server/observations/save";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The data-entry sheet of one site as JSON (`?trialId=&siteId=`), for the client to refresh. */
export const GET = defineRoute({ roles: "signed-in" }, async ({ viewer, request }) => {
  const search = new URL(request.url).searchParams;
  return Response.json(await getRecordingSheetForApi(viewer, { trialId: search.get("trialId"), siteId: search.get("siteId") }), { headers: { "Cache-Control": "private, no-store" } });
});

/**
 * A save's answer is a few hundred bytes: gzipping it (Next compresses any answer whose length it does not know)
 * costs the server more than sending it, so `no-transform` tells Next's compression to leave it alone.
 */
const SAVE_ANSWER_HEADERS = { "Cache-Control": "private, no-store, no-transform" };

/**
 * Saves values typed in the data-entry form; answers per-field problems with 400, and values someone else
 * changed since the phone last saw them with 409 and both values, writing nothing in either case.
 */
export const POST = defineRoute({ roles: "signed-in", body: { kind: "observations", as: "json" } }, async ({ viewer, body }) => {
  try {
    return Response.json(await saveObservationsForViewer(viewer, body), { headers: SAVE_ANSWER_HEADERS });
  } catch (e) {
    // The form shows both values and lets the grower choose.
    if (e instanceof StaleValuesError) return Response.json({ error: e.message, conflicts: e.conflicts }, { status: 409, headers: SAVE_ANSWER_HEADERS });
    throw e;
  }
});
