import { z } from "zod";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { AppError, toResponse } from "@/lib/errors";

const filtersSchema = z.object({
  q: z.string().max(100).optional(),
  crop: z.string().max(80).optional(),
  season: z.string().max(80).optional(),
});

/** Published trials as JSON (the same list as the public index). */
export async function GET(request: Request) {
  try {
    const parsed = filtersSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
    if (!parsed.success) throw new AppError("bad_request", "Search terms must be under 100 characters.");
    const { trials } = await listPublicTrials(parsed.data);
    return Response.json({ trials });
  } catch (e) {
    return toResponse(e);
  }
}
