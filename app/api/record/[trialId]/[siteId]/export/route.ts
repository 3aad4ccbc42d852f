import { assertRole } from "@/server/auth/guards";
import { toResponse } from "@/lib/errors";
import { csvExportForViewer } from "@/server/spreadsheets/files";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The site's recorded values as CSV. */
export async function GET(_request: Request, context: { params: Promise<{ trialId: string; siteId: string }> }) {
  try {
    const viewer = await assertRole();
    const file = await csvExportForViewer(viewer, await context.params);
    return new Response(file.body, {
      headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${file.fileName}"`, "Cache-Control": "private, no-store" },
    });
  } catch (e) {
    return toResponse(e);
  }
}
