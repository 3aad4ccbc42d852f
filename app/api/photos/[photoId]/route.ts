import { z } from "zod";
import { idParam } from "@/lib/validation/common";
import { readPhotoForViewer } from "@/server/photos/upload";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export const GET = defineRoute(
  { roles: "signed-in", params: { schema: z.object({ photoId: idParam }), message: "That photo does not exist." } },
  async ({ viewer, params }) => {
    const photo = await readPhotoForViewer(viewer, params.photoId);
    return new Response(new Uint8Array(photo.bytes), { headers: { "Content-Type": photo.contentType, "Cache-Control": "private, max-age=3600", "X-Content-Type-Options": "nosniff" } });
  },
);

