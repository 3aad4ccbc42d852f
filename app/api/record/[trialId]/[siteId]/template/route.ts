import { assertRole } from "@/server/auth/guards";
import { toResponse } from "@/lib/errors";
import { templateForViewer } from "@/server/spreadsheets/files";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The site's data-entry workbook. */
export async function GET(_request: Request, context: { params: Promise<{ trialId: string; siteId: string }> }) {
  try {
    const viewer = await assertRole();
    const file = await templateForViewer(viewer, await context.params);
    return new Response(new Uint8Array(file.body), {
      headers: {
        "Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
        "Content-Disposition": `attachment; filename="${file.fileName}"`,
        "Cache-Control": "private, no-store",
      },
    });
  } catch (e) {
    return toResponse(e);
  }
}
