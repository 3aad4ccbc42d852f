import "server-only";
import { promises as fs } from "node:fs";
import path from "node:path";
import { env } from "@/lib/env";

/** A message captured by the local fake SMTP server. */
export interface CapturedMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

/** Messages captured by the fake SMTP server, newest first. Only meaningful when MAIL_MODE is capture. */
export async function listCapturedMail(limit = 100): Promise<CapturedMail[]> {
  if (env.MAIL_MODE !== "capture") return [];
  const dir = path.resolve(env.MAILBOX_DIR);
  let names: string[];
  try {
    names = (await fs.readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  names.sort().reverse();
  const mails = await Promise.all(
    names.slice(0, limit).map(async (n) => JSON.parse(await fs.readFile(path.join(dir, n), "utf8")) as CapturedMail),
  );
  return mails;
}
