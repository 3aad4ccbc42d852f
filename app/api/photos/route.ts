import { assertRole } from "@/lib/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { uploadPhotoForViewer } from "@/lib/photos/upload";
import { MAX_PHOTO_BYTES } from "@/lib/photos/images";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** Attaches a photo (multipart `file`, `trialId`, `siteId`, optional `plotId`, `caption`, `takenOn`, `keepLocation`). */
export async function POST(request: Request) {
  try {
    const viewer = await assertRole();
    if (Number(request.headers.get("content-length") ?? 0) > MAX_PHOTO_BYTES + 64 * 1024) throw new AppError("bad_request", `The photo is larger than the ${MAX_PHOTO_BYTES / 1024 / 1024} MB limit.`);
    const form = await request.formData().catch(() => null);
    const file = form?.get("file");
    if (!form || !(file instanceof File)) throw new AppError("bad_request", "Choose a photo to attach.");
    if (file.size > MAX_PHOTO_BYTES) throw new AppError("bad_request", `The photo is larger than the ${MAX_PHOTO_BYTES / 1024 / 1024} MB limit.`);
    const fields = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string"));
    return Response.json(await uploadPhotoForViewer(viewer, fields, new Uint8Array(await file.arrayBuffer())));
  } catch (e) {
    return toResponse(e);
  }
}
