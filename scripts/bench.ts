// Every benchmark in turn, then one table of their figures:
//   npm run bench                                   # builds (if there is no build) and starts its own server on :3250
//   npm run bench -- --url http://127.0.0.1:3000    # or BENCH_BASE_URL=...: a server that is already running
// The server must use DATABASE_URL (npm run bench reads .env.local, as the other bench commands do): bench:load
// and bench:analysis add throwaway trials there and remove them. bench:upload runs only when
// BENCH_UPLOAD_DATABASE_URL names a test database (it leaves its 10,000-plot trial behind).
// Each script prints its figures as RESULT lines (figure, value, unit, ratio to the floor, target, met);
// a script that prints none is listed with its exit status. The server's peak memory (RSS of its process
// and children, sampled every 200 ms) is printed for the public-pages and load runs; with --url it is
// known only when BENCH_SERVER_PID names the server's process.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, readFileSync, readdirSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import path from "node:path";

const root = path.resolve(import.meta.dirname, "..");
const urlArgument = process.argv.indexOf("--url");
const givenUrl = (urlArgument > 0 ? process.argv[urlArgument + 1] : undefined) ?? process.env.BENCH_BASE_URL;
const PORT = Number(process.env.BENCH_PORT ?? 3250);
const DIST = process.env.NEXT_DIST_DIR ?? ".next";
const DATABASE_URL = process.env.DATABASE_URL ?? "";

interface Bench {
  name: string;
  args: string[];
  env?: Record<string, string>;
  /** sample the server's memory while it runs */
  load?: boolean;
  skip?: string;
}

interface Row {
  bench: string;
  figure: string;
  value: string;
  unit: string;
  ratio: string;
  target: string;
  met: string;
}

const tsx = path.join(root, "node_modules/.bin/tsx");
const next = path.join(root, "node_modules/.bin/next");
const nextStart = path.join(root, "scripts/next-start.sh");

function run(command: string, args: string[], env: Record<string, string> = {}): Promise<{ status: number; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: root, env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    child.stdout.on("data", (d: Buffer) => {
      output += d;
      process.stdout.write(d);
    });
    child.stderr.on("data", (d: Buffer) => process.stderr.write(d));
    child.on("close", (status) => resolve({ status: status ?? 1, output }));
  });
}

/** RSS in bytes of a process and all its descendants, from /proc. */
function treeRss(pid: number): number {
  const children = new Map<number, number[]>();
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
    } catch {
      // the process ended while we looked
    }
  }
  let total = 0;
  for (const stack = [pid]; stack.length > 0; ) {
    const p = stack.pop()!;
    try {
      const kb = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${p}/status`, "utf8"))?.[1];
      total += Number(kb ?? 0) * 1024;
    } catch {
      // ended
    }
    stack.push(...(children.get(p) ?? []));
  }
  return total;
}

async function waitFor(url: string, seconds: number): Promise<boolean> {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (await fetch(url, { signal: AbortSignal.timeout(2000) }).then((r) => r.ok, () => false)) return true;
    await new Promise((r) => setTimeout(r, 250));
  }
  return false;
}

let server: ChildProcess | null = null;
let serverPid = Number(process.env.BENCH_SERVER_PID ?? 0) || null;
let base = givenUrl?.replace(/\/$/, "");
if (!base) {
  if (!DATABASE_URL) throw new Error("Set DATABASE_URL (npm run bench reads .env.local) or give --url of a running server.");
  if (!existsSync(path.join(root, DIST, "BUILD_ID"))) {
    console.log(`No build in ${DIST}; building it (next build).`);
    const built = await run(next, ["build"], { NEXT_DIST_DIR: DIST });
    if (built.status !== 0) throw new Error("The build failed.");
  }
  base = `http://127.0.0.1:${PORT}`;
  console.log(`Starting next start on ${base} (build ${DIST}, database from DATABASE_URL).`);
  server = spawn("bash", [nextStart, "-H", "127.0.0.1", "-p", String(PORT)], {
    cwd: root,
    detached: true,
    stdio: "ignore",
    env: { ...process.env, NODE_ENV: "production", NEXT_DIST_DIR: DIST, APP_URL: base, NEXTAUTH_URL: base, SEEDPLOT_DISABLE_JOBS: "1" },
  });
  serverPid = server.pid ?? null;
  if (!(await waitFor(`${base}/`, 60))) throw new Error(`The server on ${base} did not answer within a minute.`);
}

const stopServer = () => {
  if (server?.pid) {
    try {
      process.kill(-server.pid, "SIGTERM");
    } catch {
      // already gone
    }
  }
};
process.on("exit", stopServer);
process.on("SIGINT", () => process.exit(130));

/** The server's CPU time per save is printed by bench:load when it knows the server's process (LOAD_CPU_PIDS). */
function serverCpu(): Record<string, string> {
  return process.env.LOAD_CPU_PIDS || !serverPid ? {} : { LOAD_CPU_PIDS: `server=${serverPid}` };
}

const uploadUrl = process.env.BENCH_UPLOAD_DATABASE_URL ?? "";
const benches: Bench[] = [
  { name: "bench:stats", args: ["scripts/bench-stats.ts"] },
  { name: "bench:public", args: ["scripts/bench-public.ts"], env: { BENCH_BASE_URL: base }, load: true },
  // The saves are timed at the steady state, after 40 saves per grower that warm the save code up; the warm-up's
  // own figures (a fresh server's first 2,000 saves) are printed as well. LOAD_WARMUP_SAVES=0 times a cold server.
  { name: "bench:load", args: ["--conditions", "react-server", "scripts/bench-load.ts"], env: { LOAD_BASE_URL: base, DATABASE_URL, LOAD_WARMUP_SAVES: process.env.LOAD_WARMUP_SAVES ?? "40", ...serverCpu() }, load: true },
  { name: "bench:analysis", args: ["--conditions", "react-server", "scripts/bench-analysis.ts"], env: { BENCH_BASE_URL: base, DATABASE_URL } },
  { name: "bench:report", args: ["scripts/bench-report.mts"] },
  {
    name: "bench:upload",
    args: ["--conditions", "react-server", "scripts/bench-upload.ts"],
    env: { DATABASE_URL: uploadUrl },
    skip: uploadUrl ? undefined : "set BENCH_UPLOAD_DATABASE_URL to a test database to run it",
  },
];

const rows: Row[] = [];
const notes: string[] = [];
const startLoad = loadavg()[0];
for (const bench of benches) {
  if (bench.skip) {
    notes.push(`${bench.name}: skipped (${bench.skip})`);
    continue;
  }
  console.log(`\n=== ${bench.name}`);
  let peak = 0;
  const sampler = bench.load && serverPid ? setInterval(() => (peak = Math.max(peak, treeRss(serverPid!))), 200) : null;
  const { status, output } = await run(tsx, bench.args, bench.env);
  if (sampler) clearInterval(sampler);
  const found = output
    .split("\n")
    .filter((line) => line.startsWith("RESULT\t"))
    .map((line) => {
      const [, figure = "", value = "", unit = "", ratio = "-", target = "-", met = "-"] = line.split("\t");
      return { bench: bench.name, figure, value, unit, ratio, target, met };
    });
  rows.push(...found);
  if (bench.load && serverPid) rows.push({ bench: bench.name, figure: `peak server memory (RSS) during ${bench.name}`, value: (peak / 1024 / 1024).toFixed(0), unit: "MB", ratio: "-", target: "-", met: "-" });
  if (status !== 0) notes.push(`${bench.name}: exited with status ${status}`);
  if (found.length === 0) notes.push(`${bench.name}: printed no RESULT lines (its own output is above)`);
}
if (!serverPid) notes.push("server memory: unknown (give BENCH_SERVER_PID with --url)");

const widths = { figure: 64, value: 10, ratio: 9, target: 24 };
console.log(`\n=== Summary against ${base}; load average ${startLoad.toFixed(2)} at the start, ${loadavg()[0].toFixed(2)} at the end, ${availableParallelism()} cores`);
console.log(`${"figure".padEnd(widths.figure)} ${"value".padStart(widths.value)} ${"unit".padEnd(8)} ${"of floor".padStart(widths.ratio)}  ${"target".padEnd(widths.target)} met`);
for (const r of rows) {
  const figure = r.figure.length > widths.figure ? `${r.figure.slice(0, widths.figure - 1)}…` : r.figure;
  console.log(`${figure.padEnd(widths.figure)} ${r.value.padStart(widths.value)} ${r.unit.padEnd(8)} ${r.ratio.padStart(widths.ratio)}  ${r.target.padEnd(widths.target)} ${r.met}`);
}
for (const note of notes) console.log(`note: ${note}`);
const missed = rows.filter((r) => r.met === "not met").length;
console.log(`\n${rows.filter((r) => r.met === "met").length} targets met, ${missed} not met.`);
stopServer();
process.exit(0);
