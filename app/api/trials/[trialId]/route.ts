import { z } from "zod";
import { AppError } from "@/lib/errors";
import { getTrialDetail } from "@/db/queries/trials";
import { idParam } from "@/lib/validation/common";
import { defineRoute } from "@/server/http/define-route";

export const dynamic = "force-dynamic";

/** One trial with entries (and the blind-code key), traits and sites; staff of its program only. */
export const GET = defineRoute(
  { roles: ["coordinator", "admin"], params: { schema: z.object({ trialId: idParam }), message: "That trial does not exist." } },
  async ({ viewer, params }) => {
    const detail = await getTrialDetail(viewer, params.trialId);
    if (!detail) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
    return Response.json(detail);
  },
);
