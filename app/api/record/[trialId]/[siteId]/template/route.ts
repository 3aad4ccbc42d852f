import { templateForViewer } from "@/server/spreadsheets/files";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The site's data-entry workbook. */
export const GET = defineRoute({ roles: "signed-in" }, async ({ viewer, context }) => {
  const file = await templateForViewer(viewer, await context.params);
  return new Response(new Uint8Array(file.body), {
    headers: {
      "Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
      "Content-Disposition": `attachment; filename="${file.fileName}"`,
      "Cache-Control": "private, no-store",
    },
  });
});
