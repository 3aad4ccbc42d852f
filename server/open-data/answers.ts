import "server-only";

// The open data API's answers: anonymous, read-only, published versions only. Any site may read them from
// a browser (no cookies are involved). Caches may keep them but must ask again before each use, so a
// withdrawn version is gone for every reader at once.
export const OPEN_DATA_HEADERS: Record<string, string> = {
  "Cache-Control": "public, no-cache",
  "Access-Control-Allow-Origin": "*",
  "X-Content-Type-Options": "nosniff",
};

export function openDataJson(body: unknown, headers: Record<string, string> = {}): Response {
  return Response.json(body, { headers: { ...OPEN_DATA_HEADERS, ...headers } });
}
