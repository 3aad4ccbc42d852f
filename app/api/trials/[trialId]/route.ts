import { assertRole } from "@/server/auth/guards";
import { AppError, toResponse } from "@/lib/errors";
import { getTrialDetail } from "@/db/queries/trials";
import { idParam } from "@/lib/validation/common";

export const dynamic = "force-dynamic";

/** One trial with entries (and the blind-code key), traits and sites; staff of its program only. */
export async function GET(_request: Request, context: { params: Promise<{ trialId: string }> }) {
  try {
    const viewer = await assertRole("coordinator", "admin");
    const trialId = idParam.safeParse((await context.params).trialId);
    if (!trialId.success) throw new AppError("not_found", "That trial does not exist.");
    const detail = await getTrialDetail(viewer, trialId.data);
    if (!detail) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
    return Response.json(detail);
  } catch (e) {
    return toResponse(e);
  }
}
