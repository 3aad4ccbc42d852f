import { z } from "zod";
import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { getSiteLayout } from "@/db/queries/trials";
import { buildSiteSheetData } from "@/server/trials/sheets";
import { idParam } from "@/lib/validation/common";
import { pageSizeSchema, sheetKindSchema } from "@/lib/validation/trials";
import { renderSiteSheet, SHEET_FILE_NAMES } from "@/reports/site-sheets";
import { env } from "@/lib/env";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam, siteId: idParam });

/** A site's tray/field map, plot labels or field data sheet as PDF: auth -> scoped query -> render. */
export async function GET(request: Request, context: { params: Promise<{ trialId: string; siteId: string }> }) {
  try {
    const viewer = await assertRole();
    const params = paramsSchema.safeParse(await context.params);
    if (!params.success) throw new AppError("not_found", "That trial or site does not exist.");
    const search = new URL(request.url).searchParams;
    const kind = sheetKindSchema.safeParse(search.get("kind") ?? "map");
    if (!kind.success) throw new AppError("bad_request", "Ask for a map, labels, a data sheet or a packing list.");
    // The packing list names seed lots, which could decode the blind codes: it is for the staff who pack kits.
    if (kind.data === "packing" && viewer.role === "cooperator") throw new AppError("not_found", "That trial or site does not exist, or it is not one of yours.");
    const size = pageSizeSchema.safeParse(search.get("size") ?? undefined);
    if (!size.success) throw new AppError("bad_request", "Paper size must be Letter or A4.");

    // Cooperators get their own sites only; anything else looks like a missing page.
    const layout = await getSiteLayout(viewer, params.data);
    if (!layout) throw new AppError("not_found", "That trial or site does not exist, or it is not one of yours.");
    if (layout.plots.length === 0) throw new AppError("conflict", "This site has no plot layout yet. Randomise it first.");

    // A site's own printout language (set by staff) wins over the reader's, so a kit prints alike for everyone.
    const data = await buildSiteSheetData(layout, { appUrl: env.APP_URL, pageSize: size.data, withQr: kind.data === "labels", locale: layout.printLocale ?? viewer.locale ?? "en" });
    const pdf = await renderSiteSheet(kind.data, data);
    const fileName = `${layout.code}-${layout.siteName.replace(/[^A-Za-z0-9]+/g, "-")}-${SHEET_FILE_NAMES[kind.data]}.pdf`.toLowerCase();
    return new Response(new Uint8Array(pdf), {
      headers: {
        "Content-Type": "application/pdf",
        "Content-Disposition": `inline; filename="${fileName}"`,
        "Cache-Control": "private, no-store",
      },
    });
  } catch (e) {
    return toResponse(e);
  }
}
