import "server-only";
import { AppError } from "@/lib/errors";
import { parseAnalysisQuery } from "@/lib/validation/analysis";

/** The analysis settings of a route's address; a bad one is a 400 with the reason. */
export function analysisQueryOf(search: URLSearchParams) {
  const query = parseAnalysisQuery(search);
  if (!query.ok) throw new AppError("bad_request", query.message);
  return query.data;
}

/**
 * The headers of an answer only its viewer may keep, tagged with the data version, and the 304 to send
 * instead when the client already holds that version.
 */
export function versionedAnswer(request: Request, etag: string) {
  const headers = { ETag: etag, "Cache-Control": "private, no-cache", Vary: "Cookie" };
  const match = request.headers.get("if-none-match");
  const notModified = match && match.split(",").some((t) => t.trim() === etag) ? new Response(null, { status: 304, headers }) : null;
  return { headers, notModified };
}
