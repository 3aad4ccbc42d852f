import { z } from "zod";
import { requirePublishedSnapshot, downloadName } from "@/server/publish/public-snapshots";
import { publishedCsv, publishedXlsx } from "@/lib/domain/publish/downloads";
import { AppError, toResponse } from "@/lib/errors";

export const runtime = "nodejs";

const formatSchema = z.enum(["csv", "xlsx"]);

export async function GET(request: Request, { params }: { params: Promise<{ code: string }> }) {
  try {
    const snapshot = await requirePublishedSnapshot((await params).code, request);
    const format = formatSchema.safeParse(new URL(request.url).searchParams.get("format") ?? "csv");
    if (!format.success) throw new AppError("bad_request", "Choose format=csv or format=xlsx.");
    if (format.data === "csv") {
      return new Response(publishedCsv(snapshot), {
        headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${downloadName(snapshot, "csv")}"` },
      });
    }
    return new Response(new Uint8Array(await publishedXlsx(snapshot)), {
      headers: {
        "Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
        "Content-Disposition": `attachment; filename="${downloadName(snapshot, "xlsx")}"`,
      },
    });
  } catch (e) {
    return toResponse(e);
  }
}
