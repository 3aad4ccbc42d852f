import { z } from "zod";
import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { getSiteLayout } from "@/db/queries/trials";
import { idParam } from "@/lib/validation/common";

export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam, siteId: idParam });

/** A site's plots in layout order. Growers get their own sites only, with blind codes and no variety names. */
export async function GET(_request: Request, context: { params: Promise<{ trialId: string; siteId: string }> }) {
  try {
    const viewer = await assertRole();
    const params = paramsSchema.safeParse(await context.params);
    if (!params.success) throw new AppError("not_found", "That trial or site does not exist.");
    const layout = await getSiteLayout(viewer, params.data);
    if (!layout) throw new AppError("not_found", "That trial or site does not exist, or it is not one of yours.");
    const { enrolmentId: _enrolmentId, ...rest } = layout;
    return Response.json({
      ...rest,
      plots: layout.plots.map((p) => (layout.showKey ? p : { id: p.id, plotCode: p.plotCode, block: p.block, position: p.position, tray: p.tray, traySlot: p.traySlot, blindCode: p.blindCode })),
    });
  } catch (e) {
    return toResponse(e);
  }
}
