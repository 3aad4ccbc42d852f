/** Error codes the app maps to HTTP statuses and plain messages. */
export type AppErrorCode =
  | "bad_request"
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "too_many_requests"
  | "db_unavailable";

const STATUS: Record<AppErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
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

/** Turns any thrown value into a JSON response; unknown errors become a 500 without internals. */
export function toResponse(e: unknown): Response {
  if (isAppError(e)) {
    return Response.json({ error: e.message, code: e.code, fieldErrors: e.fieldErrors }, { status: e.status });
  }
  console.error("Unexpected error", e);
  return Response.json({ error: "Something went wrong on our side. Please try again.", code: "internal" }, { status: 500 });
}
