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
const MAX_FILE_BYTES = 1_000_000;

/** The newest captured messages in `dir`, newest first, at most `limit` files read. Unreadable files are skipped. */
export async function readCapturedMail(dir: string, limit: number): Promise<CapturedMail[]> {
  let names: string[];
  try {
    names = (await fs.readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  // File names start with the time received, so name order is time order.
  names.sort().reverse();
  const mails = await Promise.all(
    names.slice(0, limit).map(async (name): Promise<CapturedMail | null> => {
      try {
        const file = path.join(dir, name);
        if ((await fs.stat(file)).size > MAX_FILE_BYTES) return null;
        const mail = JSON.parse(await fs.readFile(file, "utf8")) as CapturedMail;
        return Array.isArray(mail.to) && typeof mail.text === "string" ? mail : null;
      } catch {
        return null;
      }
    }),
  );
  return mails.filter((m): m is CapturedMail => m !== null);
}
