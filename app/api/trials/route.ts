import { listTrialsForViewer } from "@/db/queries/overview";
import { listMyLayouts } from "@/db/queries/trials";
import { defineRoute } from "@/server/http/define-route";

export const dynamic = "force-dynamic";

/** Trials the viewer works on: staff get their programs' trials, growers the trials at their own sites. */
export const GET = defineRoute({ roles: "signed-in" }, async ({ viewer }) => {
  if (viewer.role === "cooperator") return Response.json({ trials: await listMyLayouts(viewer) });
  return Response.json({ trials: await listTrialsForViewer(viewer) });
});
