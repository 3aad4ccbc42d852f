// Scale-out figures: the same reads through a small round-robin proxy written here (loopback only), first
// with one app instance behind it, then with two, in the same run on the same database, so the ratio
// shows what a second instance adds on this machine. It starts the two `next start` processes itself from
// an existing production build (scripts/up.sh or `npx next build`), and stops them at the end.
//   npm run bench:load:scale
//   SCALE_DIST_DIR=.next-test DATABASE_URL=mysql://.../seedplot_e2e npm run bench:load:scale
// Settings: SCALE_PORT_A (3650), SCALE_PORT_B (3655), SCALE_PROXY_PORT (3660), LOAD_REQUESTS per scenario
// and setting (default 400), LOAD_CONNECTIONS (default 20), LOAD_SECONDS (time cap per scenario, default 60).
// The instances use the storage settings of the environment (STORAGE_DRIVER, S3_*) and DATABASE_URL.
import autocannon from "autocannon";
import http from "node:http";
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import { randomBytes } from "node:crypto";
import path from "node:path";
import { eq, isNull } from "drizzle-orm";
import { createDatabase } from "../db/client";
import * as s from "../db/schema";

const root = path.resolve(import.meta.dirname, "..");
const DIST = process.env.SCALE_DIST_DIR ?? ".next";
const PORT_A = Number(process.env.SCALE_PORT_A ?? 3650);
const PORT_B = Number(process.env.SCALE_PORT_B ?? 3655);
const PROXY_PORT = Number(process.env.SCALE_PROXY_PORT ?? 3660);
const REQUESTS = Number(process.env.LOAD_REQUESTS ?? 400);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 20);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const COORDINATOR = { email: process.env.LOAD_COORDINATOR ?? "rosa.delgado@tamarack-valley.example", password: process.env.LOAD_COORDINATOR_PASSWORD ?? "seedplot-coordinator-demo" };
const url = process.env.DATABASE_URL ?? "";
if (!url) {
  console.error("Set DATABASE_URL to the database the instances should use (npm run bench:load:scale reads .env.local).");
  process.exit(1);
}
if (!existsSync(path.join(root, DIST, "BUILD_ID"))) {
  console.error(`No production build in ${DIST}: run scripts/up.sh or npx next build first (or set SCALE_DIST_DIR).`);
  process.exit(1);
}

const proxyBase = `http://127.0.0.1:${PROXY_PORT}`;
// Both instances must share the session secret (.env.local's when there is one), or a sign-in on one is unknown to the other.
const sessionSecret = process.env.NEXTAUTH_SECRET ?? randomBytes(32).toString("base64url");
const children: ChildProcess[] = [];

/** Starts one `next start` of the build; resolves once it answers. */
async function startInstance(port: number, name: string): Promise<ChildProcess> {
  const child = spawn("bash", [path.join(root, "scripts/next-start.sh"), "-H", "127.0.0.1", "-p", String(port)], {
    cwd: root,
    detached: true,
    stdio: ["ignore", "ignore", "pipe"],
    env: { ...process.env, NODE_ENV: "production", NEXT_DIST_DIR: DIST, NEXT_TELEMETRY_DISABLED: "1", SEEDPLOT_DISABLE_JOBS: "1", INSTANCE_NAME: name, APP_URL: proxyBase, NEXTAUTH_URL: proxyBase, NEXTAUTH_SECRET: sessionSecret },
  });
  children.push(child);
  let errors = "";
  child.stderr!.on("data", (d) => (errors = (errors + d).slice(-2000)));
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`${name} exited while starting:\n${errors}`);
    if (await fetch(`http://127.0.0.1:${port}/api/health`).then((r) => r.ok, () => false)) return child;
    if (Date.now() > deadline) throw new Error(`${name} did not answer on port ${port}:\n${errors}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** A round-robin reverse proxy on loopback: each request goes to the next backend in turn. */
function startProxy(backends: number[]) {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 256 });
  let next = 0;
  const server = http.createServer((req, res) => {
    const port = backends[next++ % backends.length]!;
    const upstream = http.request({ host: "127.0.0.1", port, method: req.method, path: req.url, headers: req.headers, agent }, (answer) => {
      res.writeHead(answer.statusCode ?? 502, answer.headers);
      answer.pipe(res);
    });
    upstream.on("error", () => {
      if (!res.headersSent) res.writeHead(502);
      res.end();
    });
    req.pipe(upstream);
  });
  return {
    setBackends: (ports: number[]) => backends.splice(0, backends.length, ...ports),
    listen: () => new Promise<void>((r) => server.listen(PROXY_PORT, "127.0.0.1", () => r())),
    close: () => {
      server.closeAllConnections();
      agent.destroy();
      return new Promise<void>((r) => server.close(() => r()));
    },
  };
}

async function signIn(email: string, password: string) {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const pair = line.split(";", 1)[0]!;
      jar.set(pair.slice(0, pair.indexOf("=")), pair.slice(pair.indexOf("=") + 1));
    }
    return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  };
  const csrf = await fetch(`${proxyBase}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${proxyBase}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: keep(csrf) },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const cookie = keep(res);
  if (!cookie.includes("session-token")) throw new Error(`Sign-in failed for ${email} (HTTP ${res.status}).`);
  return cookie;
}

async function throughput(pathname: string, headers: Record<string, string> = {}) {
  let errors = 0;
  let answered = 0;
  const started = performance.now();
  const instance = autocannon({ url: `${proxyBase}${pathname}`, connections: CONNECTIONS, amount: REQUESTS, duration: SECONDS, headers, timeout: 30 });
  instance.on("response", (_c: unknown, status: number) => {
    answered += 1;
    if (status >= 400) errors += 1;
  });
  const result = await instance;
  return { perSecond: answered / ((performance.now() - started) / 1000), errors: errors + result.errors + result.timeouts };
}

const { db, pool } = createDatabase(url, 2);
const [live] = await db
  .select({ id: s.trials.id, code: s.trials.code })
  .from(s.publishedReports)
  .innerJoin(s.trials, eq(s.trials.id, s.publishedReports.trialId))
  .where(isNull(s.publishedReports.unpublishedAt))
  .limit(1);
await pool.end();
if (!live) {
  console.error("Nothing is published in DATABASE_URL; load the demo data (npx tsx db/seed.ts) first.");
  process.exit(1);
}

const proxy = startProxy([PORT_A]);
const stopAll = () => {
  for (const c of children) {
    try {
      process.kill(-c.pid!, "SIGTERM");
    } catch {
      // already gone
    }
  }
};
process.on("exit", stopAll);
let failed = false;
try {
  console.log(`Starting two instances of ${DIST} on ports ${PORT_A} and ${PORT_B}, proxy on ${PROXY_PORT}`);
  await Promise.all([startInstance(PORT_A, "bench-a"), startInstance(PORT_B, "bench-b")]);
  await proxy.listen();
  const cookie = await signIn(COORDINATOR.email, COORDINATOR.password);
  const scenarios: { name: string; path: string; headers?: Record<string, string> }[] = [
    { name: `public page /results/${live.code}`, path: `/results/${live.code}` },
    { name: `open data API /api/public/v1/trials/${live.code}/results`, path: `/api/public/v1/trials/${live.code}/results` },
    { name: "analysis API (coordinator)", path: `/api/trials/${live.id}/analysis`, headers: { cookie } },
  ];
  const lines: string[] = [];
  for (const scenario of scenarios) {
    // Warm both instances (compiled routes, caches) so the two settings start alike.
    for (const port of [PORT_A, PORT_B]) await fetch(`http://127.0.0.1:${port}${scenario.path}`, { headers: scenario.headers }).then((r) => r.arrayBuffer());
    proxy.setBackends([PORT_A]);
    const one = await throughput(scenario.path, scenario.headers);
    proxy.setBackends([PORT_A, PORT_B]);
    const two = await throughput(scenario.path, scenario.headers);
    const ratio = two.perSecond / one.perSecond;
    console.log(`${scenario.name.padEnd(60)} 1 instance ${one.perSecond.toFixed(1).padStart(7)} req/s   2 instances ${two.perSecond.toFixed(1).padStart(7)} req/s   ratio ${ratio.toFixed(2)}   errors ${one.errors + two.errors}`);
    if (one.errors + two.errors > 0) failed = true;
    lines.push(`RESULT\t${scenario.name}, 1 instance\t${one.perSecond.toFixed(1)}\treq/s\t-\t-\t-`);
    lines.push(`RESULT\t${scenario.name}, 2 instances\t${two.perSecond.toFixed(1)}\treq/s\t${ratio.toFixed(2)}\t-\t-`);
  }
  for (const line of lines) console.log(line);
} catch (e) {
  console.error(e instanceof Error ? e.message : e);
  failed = true;
} finally {
  await proxy.close();
  stopAll();
}
process.exit(failed ? 1 : 0);
