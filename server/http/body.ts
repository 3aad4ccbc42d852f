import "server-only";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, type BodyKind } from "@/lib/domain/request-limits";
import type { Translator } from "@/lib/domain/i18n/catalogue";
import { localBodyTooLarge } from "@/lib/domain/i18n/files";

// Request bodies are read only through here, each up to its route's limit from lib/domain/request-limits.ts. A body
// is counted while it streams in and refused (413) the moment it passes the limit, whether or not the
// client declared a length, so memory holds at most the limit and never the whole of an oversized body.
// request.json() and request.formData() would buffer whatever arrives; route handlers do not call them.

const readToTheEnd = new WeakSet<Request>();

/** The 413 refusal, in the signed-in reader's language when known (`t`), else in the words the proxy uses. */
export function bodyTooLarge(kind: BodyKind, t?: Translator): AppError {
  return new AppError("payload_too_large", t ? localBodyTooLarge(t, kind) : BODY_LIMITS[kind].tooLarge);
}

/** The media type of the body, without parameters, in lower case ("" when none was sent). */
export function mediaTypeOf(headers: Headers): string {
  return (headers.get("content-type") ?? "").split(";", 1)[0]!.trim().toLowerCase();
}

function requireMediaType(request: Request, accepted: readonly string[], message: string): void {
  if (!accepted.includes(mediaTypeOf(request.headers))) throw new AppError("unsupported_media_type", message);
}

/** The declared Content-Length, or null for a body sent in chunks without one. */
function declaredLength(headers: Headers): number | null {
  const value = headers.get("content-length");
  if (value === null) return null;
  const n = Number(value);
  return Number.isFinite(n) && n >= 0 ? n : null;
}

/**
 * Reads a request's body, refusing it with a 413 as soon as it is larger than its kind's limit: at once
 * when the declared length says so, otherwise when the bytes counted so far pass the limit. The rest of
 * an oversized body is never read (see closeUnreadBody).
 */
export async function readBodyWithin(request: Request, kind: BodyKind): Promise<Uint8Array<ArrayBuffer>> {
  const limit = BODY_LIMITS[kind].bytes;
  const declared = declaredLength(request.headers);
  if (declared !== null && declared > limit) throw bodyTooLarge(kind);
  if (!request.body) {
    readToTheEnd.add(request);
    return new Uint8Array(0);
  }
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      // Cancelling would tear down the socket before the 413 could be sent; the response closes it instead.
      reader.releaseLock();
      throw bodyTooLarge(kind);
    }
    chunks.push(value);
  }
  readToTheEnd.add(request);
  return Buffer.concat(chunks, total);
}

/** A JSON body (Content-Type application/json only, so no page of another site can send one without asking first). */
export async function readJsonWithin(request: Request, kind: BodyKind): Promise<unknown> {
  requireMediaType(request, ["application/json"], "Send the values as JSON, with the header Content-Type: application/json.");
  const bytes = await readBodyWithin(request, kind);
  try {
    return JSON.parse(new TextDecoder().decode(bytes));
  } catch {
    throw new AppError("bad_request", "The values sent could not be read as JSON.");
  }
}

/** A multipart form body, as the photo and spreadsheet forms send. */
export async function readFormWithin(request: Request, kind: BodyKind): Promise<FormData> {
  requireMediaType(request, ["multipart/form-data"], "Send the file from the form on the page (multipart/form-data).");
  const bytes = await readBodyWithin(request, kind);
  try {
    return await new Response(bytes, { headers: { "content-type": request.headers.get("content-type")! } }).formData();
  } catch {
    throw new AppError("bad_request", "The form could not be read. Choose the file again and send it from the page.");
  }
}

/** A form body of short fields, as next-auth's sign-in and sign-out send (URL-encoded, or JSON for a session update). */
export async function readShortFormWithin(request: Request, kind: BodyKind): Promise<Uint8Array<ArrayBuffer>> {
  requireMediaType(request, ["application/x-www-form-urlencoded", "application/json"], "Sign in from the sign-in page.");
  return readBodyWithin(request, kind);
}

/** The form's `file` field, refused with its kind's 413 message when the file alone is over the stated limit. */
export function fileWithin(form: FormData, kind: "photo" | "spreadsheet", t?: Translator): File | null {
  const file = form.get("file");
  if (!(file instanceof File)) return null;
  if (file.size > BODY_LIMITS[kind].fileBytes) throw bodyTooLarge(kind, t);
  return file;
}

// How much of an unwanted body is read and thrown away after the refusal is sent, before the connection is
// closed: closing at once with bytes still arriving makes the operating system reset the connection, and a
// client still sending (a browser, curl, fetch) then reports the reset instead of the refusal.
const DISCARD_AFTER_REFUSAL_BYTES = 16 * 1024 * 1024;

async function discardThenClose(body: ReadableStream<Uint8Array>): Promise<void> {
  const reader = body.getReader();
  let discarded = 0;
  try {
    while (discarded <= DISCARD_AFTER_REFUSAL_BYTES) {
      const { done, value } = await reader.read();
      if (done) return;
      discarded += value.byteLength;
    }
    // Cancelling the request's body ends its connection.
    await reader.cancel();
  } catch {
    // The client went away first.
  }
}

/**
 * For route handlers that take a body, around every refusal: when the body was not read to its end (over
 * the limit, or refused before reading), the rest is read and dropped up to a bound and the connection is
 * then closed, so an oversized or unwanted body is never read in full and never kept.
 */
export function closeUnreadBody(request: Request, response: Response): Response {
  if (request.body && !request.body.locked && !readToTheEnd.has(request)) void discardThenClose(request.body);
  return response;
}
