import { AppError } from "@/lib/errors";
import { uploadPhotoForViewer } from "@/server/photos/upload";
import { fileWithin } from "@/server/http/body";
import { defineRoute } from "@/server/http/define-route";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** Attaches a photo (multipart `file`, `trialId`, `siteId`, optional `plotId`, `caption`, `takenOn`, `keepLocation`). */
export const POST = defineRoute({ roles: "signed-in", body: { kind: "photo", as: "form" } }, async ({ viewer, body: form }) => {
  const t = translatorFor(viewer.locale);
  const file = fileWithin(form, "photo", t);
  if (!file) throw new AppError("bad_request", t("photos.chooseToAttach"));
  const fields = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string"));
  return Response.json(await uploadPhotoForViewer(viewer, fields, new Uint8Array(await file.arrayBuffer())));
});
