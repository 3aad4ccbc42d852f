import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { idParam } from "@/lib/validation/common";
import { readPhotoForViewer } from "@/server/photos/upload";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export async function GET(_request: Request, context: { params: Promise<{ photoId: string }> }) {
  try {
    const viewer = await assertRole();
    const id = idParam.safeParse((await context.params).photoId);
    if (!id.success) throw new AppError("not_found", "That photo does not exist.");
    const photo = await readPhotoForViewer(viewer, id.data);
    return new Response(new Uint8Array(photo.bytes), { headers: { "Content-Type": photo.contentType, "Cache-Control": "private, max-age=3600", "X-Content-Type-Options": "nosniff" } });
  } catch (e) {
    return toResponse(e);
  }
}
