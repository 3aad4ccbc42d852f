import { z } from "zod";
import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { siteParamsSchema } from "@/lib/validation/observations";
import { commitUpload, previewUpload } from "@/server/spreadsheets/upload";
import { closeUnreadBody, fileWithin, readFormWithin } from "@/server/http/body";
import { assertOwnOrigin } from "@/server/http/origin";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const modeSchema = z.enum(["preview", "commit"], { error: "Ask for a preview or to save." });

/**
 * Takes a filled-in sheet (multipart field `file`) with `mode` preview or commit. Preview never writes;
 * commit writes every value in one transaction, or nothing and the list of problems.
 */
export async function POST(request: Request, context: { params: Promise<{ trialId: string; siteId: string }> }) {
  try {
    assertOwnOrigin(request);
    const viewer = await assertRole();
    const params = siteParamsSchema.safeParse(await context.params);
    if (!params.success) throw new AppError("not_found", "That site or trial does not exist.");
    const form = await readFormWithin(request, "spreadsheet");
    const file = fileWithin(form, "spreadsheet");
    if (!file) throw new AppError("bad_request", "Choose a file to upload.");
    const mode = modeSchema.safeParse(form.get("mode") ?? "preview");
    if (!mode.success) throw new AppError("bad_request", "Ask for a preview or to save.");
    const target = { ...params.data, bytes: new Uint8Array(await file.arrayBuffer()), fileName: file.name };
    if (mode.data === "preview") return Response.json(await previewUpload(viewer, target));
    const result = await commitUpload(viewer, target);
    return Response.json(result, { status: result.ok ? 200 : 400 });
  } catch (e) {
    return closeUnreadBody(request, toResponse(e));
  }
}
