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
    // Browsers and shared caches may keep the file but must ask again before each use, so a withdrawal
    // reaches everyone at once; a copy of a version still published costs only a 304.
    const headers = { "Cache-Control": "public, no-cache", ETag: `"${snapshot.trial.code}-v${snapshot.version}-pdf"` };
    if (request.headers.get("if-none-match")?.split(",").some((tag) => tag.trim() === headers.ETag)) return new Response(null, { status: 304, headers });
    let pdf = rendered.get(key);
    if (!pdf) {
      pdf = renderTrialReport(snapshot);
      rendered.set(key, pdf);
      pdf.catch(() => rendered.delete(key));
    }
    return new Response(new Uint8Array(await pdf), {
      headers: {
        ...headers,
        "Content-Type": "application/pdf",
        "Content-Disposition": `inline; filename="${downloadName(snapshot, "pdf")}"`,
      },
    });
  } catch (e) {
    return toResponse(e);
  }
}
