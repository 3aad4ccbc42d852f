import { requirePublishedSnapshot } from "@/server/publish/public-snapshots";
import { toResponse } from "@/lib/errors";

/** One published version as JSON: summary, entries, sites' public descriptions, results and data. */
export async function GET(request: Request, { params }: { params: Promise<{ code: string }> }) {
  try {
    const snapshot = await requirePublishedSnapshot((await params).code, request);
    return Response.json(snapshot, { headers: { "Cache-Control": "public, max-age=60" } });
  } catch (e) {
    return toResponse(e);
  }
}
