import { assertRole } from "@/server/auth/guards";
import { toResponse } from "@/lib/errors";
import { closeUnreadBody, readJsonWithin } from "@/server/http/body";
import { assertOwnOrigin } from "@/server/http/origin";
import { getRecordingSheetForApi, saveObservationsForViewer } from "@/server/observations/recording";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The data-entry sheet of one site as JSON (`?trialId=&siteId=`), for the client to refresh. */
export async function GET(request: Request) {
  try {
    const viewer = await assertRole();
    const search = new URL(request.url).searchParams;
    return Response.json(await getRecordingSheetForApi(viewer, { trialId: search.get("trialId"), siteId: search.get("siteId") }), { headers: { "Cache-Control": "private, no-store" } });
  } catch (e) {
    return toResponse(e);
  }
}

/** Saves values typed in the data-entry form; answers per-field problems with 400 and writes nothing then. */
export async function POST(request: Request) {
  try {
    assertOwnOrigin(request);
    const viewer = await assertRole();
    const body = await readJsonWithin(request, "observations");
    return Response.json(await saveObservationsForViewer(viewer, body));
  } catch (e) {
    return closeUnreadBody(request, toResponse(e));
  }
}
