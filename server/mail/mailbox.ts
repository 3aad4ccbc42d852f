import "server-only";
import path from "node:path";
import { env } from "@/lib/env";
import type { Viewer } from "@/lib/domain/viewer";
import { readCapturedMail, type CapturedMail } from "./captured-mail";

export type { CapturedMail };

/** Whether mail goes to the local capture server; only then does a test mailbox exist at all. */
export const mailIsCaptured = (): boolean => env.MAIL_MODE === "capture";

// How far back the page looks through the capture directory for the viewer's own messages.
const SCAN_LIMIT = 1000;
const SHOW_LIMIT = 50;

/**
 * Captured messages addressed to the viewer alone, newest first. Messages to anyone else are never
 * read for the web page: invitations and reset links in them would let the reader act as that person.
 * The operator of a demo machine reads all captured mail in a terminal (`npm run mailbox`).
 */
export async function listCapturedMailFor(viewer: Viewer): Promise<CapturedMail[]> {
  if (!mailIsCaptured()) return [];
  const me = viewer.email.toLowerCase();
  return readCapturedMail(path.resolve(env.MAILBOX_DIR), {
    want: SHOW_LIMIT,
    scan: SCAN_LIMIT,
    keep: (m) => m.to.length > 0 && m.to.every((to) => to.toLowerCase() === me),
  });
}
