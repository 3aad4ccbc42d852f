import "server-only";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { env } from "@/lib/env";

/**
 * The service worker scripts/build-service-worker.ts built into this server's own build folder, or null
 * (`next dev`, or a build made without that step): the pages then work online only.
 */
export async function readServiceWorker(): Promise<Buffer | null> {
  try {
    return await readFile(path.join(process.cwd(), env.NEXT_DIST_DIR, "service-worker", "sw.js"));
  } catch {
    return null;
  }
}
