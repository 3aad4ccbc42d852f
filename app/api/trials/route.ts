import { assertRole } from "@/server/auth/guards";
import { toResponse } from "@/lib/errors";
import { listTrialsForViewer } from "@/db/queries/overview";
import { listMyLayouts } from "@/db/queries/trials";

export const dynamic = "force-dynamic";

/** Trials the viewer works on: staff get their programs' trials, growers the trials at their own sites. */
export async function GET() {
  try {
    const viewer = await assertRole();
    if (viewer.role === "cooperator") return Response.json({ trials: await listMyLayouts(viewer) });
    return Response.json({ trials: await listTrialsForViewer(viewer) });
  } catch (e) {
    return toResponse(e);
  }
}
