import { assertRole } from "@/server/auth/guards";
import { toResponse } from "@/lib/errors";
import { listSitesForStaff } from "@/db/queries/sites";
import { listMySites } from "@/db/queries/overview";

export const dynamic = "force-dynamic";

/** Partner sites: all with contacts for staff; a grower's own sites, without contacts, for growers. */
export async function GET() {
  try {
    const viewer = await assertRole();
    if (viewer.role === "cooperator") return Response.json({ sites: await listMySites(viewer) });
    return Response.json({ sites: await listSitesForStaff(viewer) });
  } catch (e) {
    return toResponse(e);
  }
}
