import { defineRoute } from "@/server/http/define-route";
import { API_BASE } from "@/lib/domain/publish/open-data";

/** The first, unversioned address of the trial list: a permanent redirect to the open data API (next.config.ts redirects answer it first). */
export const GET = defineRoute({ roles: "public" }, async ({ request }) =>
  new Response(null, { status: 308, headers: { Location: `${API_BASE}/trials${new URL(request.url).search}` } }),
);
