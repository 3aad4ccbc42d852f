import { csvExportForViewer } from "@/server/spreadsheets/files";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The site's recorded values as CSV. */
export const GET = defineRoute({ roles: "signed-in" }, async ({ viewer, context }) => {
  const file = await csvExportForViewer(viewer, await context.params);
  return new Response(file.body, {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${file.fileName}"`, "Cache-Control": "private, no-store" },
  });
});
