import "server-only";
import { readFileSync } from "node:fs";
import path from "node:path";
import { env } from "@/lib/env";
import { pingDatabase } from "@/db/queries/health";
import { getStorage } from "@/server/storage";
import { isDraining } from "@/server/shutdown";

// What a load balancer needs and nothing more: whether this instance can serve (database and storage reachable,
// not shutting down) and which build it runs. No error text, host names, bucket or version numbers: the route
// is anonymous. Answers are kept for a moment, so a flood of checks costs the database one query per interval.
const KEEP_MS = 2_000;
const CHECK_TIMEOUT_MS = 3_000;

export type Reachability = "ok" | "unreachable";
export interface Health {
  status: "ok" | "unavailable" | "draining";
  database: Reachability;
  storage: Reachability;
  build: string;
}

let buildId: string | null = null;
function readBuildId() {
  if (buildId === null) {
    try {
      buildId = readFileSync(path.resolve(env.NEXT_DIST_DIR, "BUILD_ID"), "utf8").trim().slice(0, 64);
    } catch {
      buildId = "development";
    }
  }
  return buildId;
}

async function reachable(check: () => Promise<void>): Promise<Reachability> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error("timed out")), CHECK_TIMEOUT_MS)));
  try {
    await Promise.race([check(), timeout]);
    return "ok";
  } catch {
    return "unreachable";
  } finally {
    clearTimeout(timer);
  }
}

let last: { at: number; answer: Promise<Omit<Health, "status" | "build">> } | null = null;

/** This instance's health; `status` is "ok" only when it can serve requests. */
export async function checkHealth(): Promise<Health> {
  if (!last || Date.now() - last.at > KEEP_MS) {
    last = { at: Date.now(), answer: Promise.all([reachable(pingDatabase), reachable(() => getStorage().check())]).then(([database, storage]) => ({ database, storage })) };
  }
  const parts = await last.answer;
  const status = isDraining() ? "draining" : parts.database === "ok" && parts.storage === "ok" ? "ok" : "unavailable";
  return { status, ...parts, build: readBuildId() };
}
