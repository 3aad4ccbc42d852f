import { z } from "zod";
import { AppError } from "@/lib/errors";
import { siteParamsSchema } from "@/lib/validation/observations";
import { commitUpload, previewUpload } from "@/server/spreadsheets/upload";
import { fileWithin } from "@/server/http/body";
import { defineRoute } from "@/server/http/define-route";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const modeSchema = z.enum(["preview", "commit"]);

/**
 * Takes a filled-in sheet (multipart field `file`) with `mode` preview or commit. Preview never writes;
 * commit writes every value in one transaction, or nothing and the list of problems.
 */
export const POST = defineRoute(
  {
    roles: "signed-in",
    params: { schema: siteParamsSchema, message: "That site or trial does not exist." },
    body: { kind: "spreadsheet", as: "form" },
  },
  async ({ viewer, params, body: form }) => {
    const t = translatorFor(viewer.locale);
    const file = fileWithin(form, "spreadsheet", t);
    if (!file) throw new AppError("bad_request", t("upload.chooseFile"));
    const mode = modeSchema.safeParse(form.get("mode") ?? "preview");
    if (!mode.success) throw new AppError("bad_request", "Ask for a preview or to save.");
    const target = { ...params, bytes: new Uint8Array(await file.arrayBuffer()), fileName: file.name };
    if (mode.data === "preview") return Response.json(await previewUpload(viewer, target));
    const result = await commitUpload(viewer, target);
    return Response.json(result, { status: result.ok ? 200 : 400 });
  },
);
