import { z } from "zod";
import { AppError } from "@/lib/errors";
import { getSiteLayout } from "@/db/queries/trials";
import { idParam } from "@/lib/validation/common";
import { defineRoute } from "@/server/http/define-route";

export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam, siteId: idParam });

/** A site's plots in layout order. Growers get their own sites only, with blind codes and no variety names. */
export const GET = defineRoute(
  { roles: "signed-in", params: { schema: paramsSchema, message: "That trial or site does not exist." } },
  async ({ viewer, params }) => {
    const layout = await getSiteLayout(viewer, params);
    if (!layout) throw new AppError("not_found", "That trial or site does not exist, or it is not one of yours.");
    const { enrolmentId: _enrolmentId, ...rest } = layout;
    return Response.json({
      ...rest,
      plots: layout.plots.map((p) => (layout.showKey ? p : { id: p.id, plotCode: p.plotCode, block: p.block, position: p.position, tray: p.tray, traySlot: p.traySlot, blindCode: p.blindCode })),
    });
  },
);
