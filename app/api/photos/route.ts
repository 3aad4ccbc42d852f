import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { uploadPhotoForViewer } from "@/server/photos/upload";
import { closeUnreadBody, fileWithin, readFormWithin } from "@/server/http/body";
import { assertOwnOrigin } from "@/server/http/origin";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** Attaches a photo (multipart `file`, `trialId`, `siteId`, optional `plotId`, `caption`, `takenOn`, `keepLocation`). */
export async function POST(request: Request) {
  try {
    assertOwnOrigin(request);
    const viewer = await assertRole();
    const form = await readFormWithin(request, "photo");
    const file = fileWithin(form, "photo");
    if (!file) throw new AppError("bad_request", "Choose a photo to attach.");
    const fields = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string"));
    return Response.json(await uploadPhotoForViewer(viewer, fields, new Uint8Array(await file.arrayBuffer())));
  } catch (e) {
    return closeUnreadBody(request, toResponse(e));
  }
}
