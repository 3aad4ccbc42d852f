// A second `next start` of the test build with settings of its own (the suite's server runs with the demo
// settings: mail captured, no trusted proxy), sharing the e2e database.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";
import { sparePort } from "./ports";

const root = path.resolve(import.meta.dirname, "../..");

export interface AppServer {
  base: string;
  stop: () => Promise<void>;
  /** What the server has printed so far. */
  output: () => string;
  /** Ends the server at once (SIGKILL), as a crash would. */
  kill: () => Promise<void>;
}

export async function startAppServer(settings: Record<string, string | undefined>): Promise<AppServer> {
  const distDir = process.env.NEXT_DIST_DIR ?? ".next-test";
  if (!existsSync(path.join(root, distDir, "BUILD_ID"))) throw new Error(`No test build in ${distDir}; run through scripts/test.sh, which builds it.`);
  const port = await sparePort();
  const base = `http://localhost:${port}`;
  const env: Record<string, string | undefined> = {
    ...process.env,
    NODE_ENV: "production",
    NEXT_DIST_DIR: distDir,
    NEXT_TELEMETRY_DISABLED: "1",
    SEEDPLOT_DISABLE_JOBS: "1",
    DATABASE_URL: process.env.E2E_DATABASE_URL,
    APP_URL: base,
    NEXTAUTH_URL: base,
    NEXTAUTH_SECRET: "seedplot-second-server-secret-0123456789",
    MAIL_MODE: undefined,
    TRUSTED_PROXIES: undefined,
    ...settings,
  };
  for (const key of Object.keys(env)) if (env[key] === undefined) delete env[key];
  let log = "";
  let exited = false;
  // Its own process group, so stopping it also stops whatever next starts.
  const child: ChildProcess = spawn("bash", [path.join(root, "scripts/next-start.sh"), "-H", "127.0.0.1", "-p", String(port)], {
    cwd: root,
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
    env: env as NodeJS.ProcessEnv,
  });
  child.stdout!.on("data", (d) => (log += d));
  child.stderr!.on("data", (d) => (log += d));
  child.once("exit", () => (exited = true));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (exited) throw new Error(`next start exited:\n${log}`);
    if (await fetch(`${base}/`, { signal: AbortSignal.timeout(2000) }).then((r) => r.ok, () => false)) break;
    if (Date.now() > deadline) throw new Error(`next start did not answer:\n${log}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    base,
    output: () => log,
    async kill() {
      if (exited) return;
      process.kill(-child.pid!, "SIGKILL");
      while (!exited) await new Promise((r) => setTimeout(r, 20));
    },
    async stop() {
      if (exited) return;
      try {
        process.kill(-child.pid!, "SIGTERM");
      } catch {
        return;
      }
      const until = Date.now() + 10_000;
      while (!exited && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
      if (!exited) process.kill(-child.pid!, "SIGKILL");
    },
  };
}
