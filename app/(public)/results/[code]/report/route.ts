import { requirePublishedSnapshot, downloadName } from "@/server/publish/public-snapshots";
import { renderTrialReport } from "@/reports/trial-report/render";
import { toResponse } from "@/lib/errors";

export const runtime = "nodejs";

// Published versions never change, so a rendered PDF can be kept for the life of the process.
const rendered = new Map<string, Promise<Buffer>>();

export async function GET(request: Request, { params }: { params: Promise<{ code: string }> }) {
  try {
    const snapshot = await requirePublishedSnapshot((await params).code, request);
    const key = `${snapshot.trial.code}:${snapshot.version}`;
    let pdf = rendered.get(key);
    if (!pdf) {
      pdf = renderTrialReport(snapshot);
      rendered.set(key, pdf);
      pdf.catch(() => rendered.delete(key));
    }
    return new Response(new Uint8Array(await pdf), {
      headers: {
        "Content-Type": "application/pdf",
        "Content-Disposition": `inline; filename="${downloadName(snapshot, "pdf")}"`,
        "Cache-Control": "public, max-age=300",
      },
    });
  } catch (e) {
    return toResponse(e);
  }
}
