import { z } from "zod";
import { defineRoute } from "@/server/http/define-route";
import { API_BASE } from "@/lib/domain/publish/open-data";

/** The first, unversioned address of one trial: a permanent redirect to the open data API (?version= kept; next.config.ts redirects answer it first). */
export const GET = defineRoute({ roles: "public", params: { schema: z.object({ code: z.string().regex(/^[A-Za-z0-9-]{1,40}$/) }) } }, async ({ params, request }) =>
  new Response(null, { status: 308, headers: { Location: `${API_BASE}/trials/${params.code}${new URL(request.url).search}` } }),
);
