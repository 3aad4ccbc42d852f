import { z } from "zod";
import { requirePublishedSnapshot, downloadName } from "@/server/publish/public-snapshots";
import { publishedCsv, publishedMeansCsv, publishedXlsx } from "@/lib/domain/publish/downloads";
import { AppError, toResponse } from "@/lib/errors";

export const runtime = "nodejs";

const formatSchema = z.enum(["csv", "xlsx"]);
const tableSchema = z.enum(["plots", "means"]);

export async function GET(request: Request, { params }: { params: Promise<{ code: string }> }) {
  try {
    const snapshot = await requirePublishedSnapshot((await params).code, request);
    const format = formatSchema.safeParse(new URL(request.url).searchParams.get("format") ?? "csv");
    if (!format.success) throw new AppError("bad_request", "Choose format=csv or format=xlsx.");
    if (format.data === "csv") {
      // a CSV holds one table: the plot data, or with table=means the means with % of check
      const table = tableSchema.safeParse(new URL(request.url).searchParams.get("table") ?? "plots");
      if (!table.success) throw new AppError("bad_request", "Choose table=plots or table=means.");
      const means = table.data === "means";
      return new Response(means ? publishedMeansCsv(snapshot) : publishedCsv(snapshot), {
        headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${downloadName(snapshot, means ? "means.csv" : "csv")}"` },
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
