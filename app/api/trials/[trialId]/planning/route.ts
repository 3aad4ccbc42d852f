import { z } from "zod";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/validation/common";
import { planningSourceQuerySchema } from "@/lib/validation/planning";
import { defineRoute } from "@/server/http/define-route";
import { planningBaseline } from "@/server/trials/planning";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam });

function planningQueryOf(search: URLSearchParams) {
  const parsed = planningSourceQuerySchema.safeParse({ from: search.get("from") ?? undefined, trait: search.get("trait") ?? undefined });
  if (!parsed.success) throw new AppError("bad_request", "Choose a past trial and one of its traits from the lists.");
  return parsed.data;
}

/** The CV and mean a past trial of the same crop reached for a trait, to plan this trial's size (staff of its program). */
export const GET = defineRoute(
  { roles: ["coordinator", "admin"], params: { schema: paramsSchema, message: "That trial does not exist." }, query: planningQueryOf },
  async ({ viewer, params, query }) => Response.json(await planningBaseline(viewer, params.trialId, query), { headers: { "Cache-Control": "private, no-store" } }),
);
