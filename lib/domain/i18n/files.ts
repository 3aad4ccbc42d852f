import type { Translator } from "./catalogue";
import { BODY_LIMITS, statedFileLimit, type BodyKind } from "@/lib/domain/request-limits";

// File-size refusals in the reader's language. lib/domain/request-limits.ts keeps the figures (and the English
// words the proxy answers with before anyone is known); these say the same for a grower in their own language.

const MB = 1024 * 1024;

/** A file's size in MB with one decimal, written the reader's way ("7.2", "7,2"). */
export const sizeInMb = (bytes: number, locale: string) => new Intl.NumberFormat(locale, { minimumFractionDigits: 1, maximumFractionDigits: 1, useGrouping: false }).format(bytes / MB);

/** "This file is 7.2 MB; the limit is 5 MB. Remove pictures…" (client forms say the same through files.tooLarge). */
export function localFileTooLarge(t: Translator, kind: "photo" | "spreadsheet", bytes: number): string {
  return t("files.tooLarge", { kind, size: sizeInMb(bytes, t.locale), limit: statedFileLimit(kind) });
}

/** A request body over its route's limit (413), for a signed-in reader. */
export function localBodyTooLarge(t: Translator, kind: BodyKind): string {
  // Sign-in requests come before anyone is known, so they keep the one wording the proxy uses.
  if (kind === "auth") return BODY_LIMITS.auth.tooLarge;
  return t("refusals.bodyTooLarge", { kind, limit: `${limitOf(kind)} MB` });
}

function limitOf(kind: BodyKind): number {
  const limit = BODY_LIMITS[kind];
  return ("fileBytes" in limit ? limit.fileBytes : limit.bytes) / MB;
}
