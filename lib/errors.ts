/** Error codes the app maps to HTTP statuses and plain messages. */
export type AppErrorCode =
  | "bad_request"
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "payload_too_large"
  | "unsupported_media_type"
  | "too_many_requests"
  | "db_unavailable";

const STATUS: Record<AppErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  too_many_requests: 429,
  db_unavailable: 503,
};

/** An error whose message is safe to show to the person who caused it. */
export class AppError extends Error {
  constructor(
    public readonly code: AppErrorCode,
    message: string,
    public readonly fieldErrors?: Record<string, string[]>,
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return STATUS[this.code];
  }
}

export const isAppError = (e: unknown): e is AppError => e instanceof AppError;

// mysql2 marks errors that end a connection as fatal; these codes also cover a refused or reset socket
// and a server that is shutting down, which are the ways a MariaDB restart shows up in the driver.
const CONNECTION_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "EHOSTUNREACH",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR",
  "ER_CON_COUNT_ERROR",
  "ER_SERVER_SHUTDOWN",
  "ER_CONNECTION_KILLED",
]);

/** Whether an error (or anything in its cause chain, as Drizzle wraps driver errors) means MariaDB cannot be reached. */
export function isDatabaseUnreachable(e: unknown, depth = 0): boolean {
  if (!e || typeof e !== "object" || depth > 5) return false;
  const err = e as { code?: unknown; fatal?: unknown; cause?: unknown; errors?: unknown };
  if (typeof err.code === "string" && CONNECTION_CODES.has(err.code)) return true;
  if (err.fatal === true) return true;
  if (Array.isArray(err.errors) && err.errors.some((x) => isDatabaseUnreachable(x, depth + 1))) return true;
  return isDatabaseUnreachable(err.cause, depth + 1);
}

// Drizzle's own message is the SQL text; the driver's code underneath is what an operator needs.
function rootCause(e: unknown): string {
  let cur: unknown = e;
  for (let i = 0; i < 5 && cur && typeof cur === "object" && "cause" in cur && (cur as { cause?: unknown }).cause; i += 1) cur = (cur as { cause: unknown }).cause;
  const err = cur as { code?: unknown; message?: unknown };
  return [err?.code, err?.message].filter((x) => typeof x === "string" && x).join(" ") || String(cur);
}

export const DB_UNAVAILABLE_MESSAGE = "Seedplot cannot reach its database just now. Nothing was lost; please try again in a minute.";

/** An AppError for anything the person can act on (including a database outage), otherwise null. */
export function asAppError(e: unknown): AppError | null {
  if (isAppError(e)) return e;
  if (isDatabaseUnreachable(e)) return new AppError("db_unavailable", DB_UNAVAILABLE_MESSAGE);
  return null;
}

/** Turns any thrown value into a JSON response; unknown errors become a 500 without internals. */
export function toResponse(e: unknown): Response {
  const known = asAppError(e);
  if (known) {
    // A database outage is logged once per request so operators see it; the answer stays plain.
    if (known.code === "db_unavailable" && !isAppError(e)) console.error("[db] unavailable:", rootCause(e));
    const headers: HeadersInit = known.code === "db_unavailable" ? { "Retry-After": "30" } : {};
    return Response.json({ error: known.message, code: known.code, fieldErrors: known.fieldErrors }, { status: known.status, headers });
  }
  console.error("Unexpected error", e);
  return Response.json({ error: "Something went wrong on our side. Please try again.", code: "internal" }, { status: 500 });
}
