import "server-only";
import type { z } from "zod";
import { assertRole } from "@/server/auth/guards";
import { AppError, isAppError, toResponse, type AppErrorCode } from "@/lib/errors";
import type { BodyKind } from "@/lib/domain/request-limits";
import type { Role } from "@/lib/domain/vocabulary/enums";
import type { Viewer } from "@/lib/domain/viewer";
import { bodyTooLarge, closeUnreadBody, readFormWithin, readJsonWithin, readShortFormWithin } from "./body";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { assertOwnOrigin } from "./origin";

// The one skeleton of every route handler under app/api: the origin check for anything that changes state,
// the role check, params, query and body parsed before the handler runs, and every AppError turned into its
// answer by toResponse. Ownership of what a request touches is checked by the use case the handler calls.

/** Where a failed parse sends the request: a wrong id in a path is "not found"; a wrong search term is "bad request". */
interface Checked<S extends z.ZodType> {
  schema: S;
  refuse?: Extract<AppErrorCode, "not_found" | "bad_request">;
  /** The answer's message; the first zod issue's message when left out. */
  message?: string;
}

/** A query is a zod schema over the search parameters, or a parser that throws an AppError. */
type QuerySource<Q> = Checked<z.ZodType<Q>> | ((search: URLSearchParams) => Q);

/** How a body is read: always through server/http/body.ts, cut off at its kind's limit from lib/domain/request-limits.ts. */
type BodySource =
  | { kind: BodyKind; as: "json" }
  | { kind: BodyKind; as: "form" }
  /** Raw bytes of a short form (URL-encoded or JSON), for next-auth, which reads the body itself. */
  | { kind: BodyKind; as: "short-form" };

type BodyOf<B> = B extends { as: "json" } ? unknown : B extends { as: "form" } ? FormData : B extends { as: "short-form" } ? Uint8Array<ArrayBuffer> : undefined;

/** "public" routes never look the viewer up; "signed-in" takes any role; a list takes those roles only. */
type Roles = "public" | "signed-in" | readonly Role[];

// Next hands route handlers their dynamic segments as a promise; the schema in `params` says what they must be.
type RouteContext = { params: Promise<Record<string, string | string[] | undefined>> };

export interface RouteInput<R extends Roles, P, Q, B> {
  request: Request;
  /** Next's own context, for a handler that passes it on (next-auth). */
  context: RouteContext;
  viewer: R extends "public" ? null : Viewer;
  params: P;
  query: Q;
  body: BodyOf<B>;
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

function parseChecked<S extends z.ZodType>(source: Checked<S>, input: unknown, refuse: "not_found" | "bad_request"): z.infer<S> {
  const parsed = source.schema.safeParse(input);
  if (parsed.success) return parsed.data;
  throw new AppError(source.refuse ?? refuse, source.message ?? parsed.error.issues[0]?.message ?? "That request was not understood.");
}

async function readBody(request: Request, body: BodySource | undefined): Promise<unknown> {
  if (!body) return undefined;
  if (body.as === "json") return readJsonWithin(request, body.kind);
  if (body.as === "form") return readFormWithin(request, body.kind);
  return readShortFormWithin(request, body.kind);
}

/**
 * Wraps a route handler. In order: a request that changes state must come from Seedplot's own pages (403);
 * the viewer must have one of `roles` (401/403); `params` and `query` must parse (404/400); the body is
 * read only within its kind's limit (413) and with its content type (415). Any refusal settles a body
 * left unread (closeUnreadBody), so an oversized or unwanted upload is never read in full.
 */
export function defineRoute<R extends Roles, P = undefined, Q = undefined, B extends BodySource | undefined = undefined>(
  options: { roles: R; params?: Checked<z.ZodType<P>>; query?: QuerySource<Q>; body?: B },
  handler: (input: RouteInput<R, P, Q, B>) => Promise<Response>,
) {
  // Routes without dynamic segments are also called with the request alone (in tests and by Next).
  return async (request: Request, context: RouteContext = { params: Promise.resolve({}) }): Promise<Response> => {
    try {
      if (!SAFE_METHODS.has(request.method.toUpperCase())) assertOwnOrigin(request);
      const roles: Roles = options.roles;
      const viewer = roles === "public" ? null : await assertRole(...(roles === "signed-in" ? [] : roles));
      const params = options.params ? parseChecked(options.params, await context.params, "not_found") : undefined;
      const search = () => new URL(request.url).searchParams;
      const query =
        options.query === undefined
          ? undefined
          : typeof options.query === "function"
            ? options.query(search())
            : parseChecked(options.query, Object.fromEntries(search()), "bad_request");
      const body = await readBody(request, options.body).catch((e: unknown) => {
        // A body over its limit is refused in the signed-in reader's own language.
        throw viewer && options.body && isAppError(e) && e.code === "payload_too_large" ? bodyTooLarge(options.body.kind, translatorFor(viewer.locale)) : e;
      });
      return await handler({ request, context, viewer, params, query, body } as RouteInput<R, P, Q, B>);
    } catch (e) {
      return closeUnreadBody(request, toResponse(e));
    }
  };
}
