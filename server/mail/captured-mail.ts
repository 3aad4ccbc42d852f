import "server-only";
import { promises as fs } from "node:fs";
import path from "node:path";

/** A message captured by the local fake SMTP server (scripts/fake-smtp.ts writes one JSON file each). */
export interface CapturedMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

// Seedplot's own messages are a few kilobytes; anything far larger did not come from the app.
const MAX_FILE_BYTES = 256_000;

/**
 * The newest captured messages in `dir` that pass `keep`, newest first: at most `want` of them, looking at
 * no more than `scan` files. Files are read one at a time, so memory holds one file and the kept ones.
 * Unreadable or oversized files are skipped.
 */
export async function readCapturedMail(
  dir: string,
  options: { want: number; scan?: number; keep?: (mail: CapturedMail) => boolean },
): Promise<CapturedMail[]> {
  const { want, scan = want, keep = () => true } = options;
  let names: string[];
  try {
    names = (await fs.readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  // File names start with the time received, so name order is time order.
  names.sort().reverse();
  const kept: CapturedMail[] = [];
  for (const name of names.slice(0, scan)) {
    const mail = await readOne(path.join(dir, name));
    if (mail && keep(mail)) kept.push(mail);
    if (kept.length >= want) break;
  }
  return kept;
}

async function readOne(file: string): Promise<CapturedMail | null> {
  try {
    if ((await fs.stat(file)).size > MAX_FILE_BYTES) return null;
    const mail = JSON.parse(await fs.readFile(file, "utf8")) as CapturedMail;
    return Array.isArray(mail.to) && mail.to.every((t) => typeof t === "string") && typeof mail.text === "string" ? mail : null;
  } catch {
    return null;
  }
}
