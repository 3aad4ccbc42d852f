import "server-only";

// The open data API's answers: anonymous, read-only, published versions only. Any site may read them from
// a browser (no cookies are involved), and caches may keep them briefly: a withdrawn version disappears
// within a minute.
export const OPEN_DATA_HEADERS: Record<string, string> = {
  "Cache-Control": "public, max-age=60",
  "Access-Control-Allow-Origin": "*",
  "X-Content-Type-Options": "nosniff",
};

export function openDataJson(body: unknown, headers: Record<string, string> = {}): Response {
  return Response.json(body, { headers: { ...OPEN_DATA_HEADERS, ...headers } });
}
