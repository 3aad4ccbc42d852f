import { listSitesForStaff } from "@/db/queries/sites";
import { listMySites } from "@/db/queries/overview";
import { defineRoute } from "@/server/http/define-route";

export const dynamic = "force-dynamic";

/** Partner sites: all with contacts for staff; a grower's own sites, without contacts, for growers. */
export const GET = defineRoute({ roles: "signed-in" }, async ({ viewer }) => {
  if (viewer.role === "cooperator") return Response.json({ sites: await listMySites(viewer) });
  return Response.json({ sites: await listSitesForStaff(viewer) });
});
