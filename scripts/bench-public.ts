// Public pages and the open data API against a running `next start`, measured against the same server's
// floor in the same run: a static JS chunk from /_next/static, which Next sends straight from disk.
//   npm run bench:public                                  # the demo server from scripts/up.sh on :3000
//   BENCH_BASE_URL=http://127.0.0.1:3250 npm run bench:public
// It reads only public addresses (no database access, nothing is changed): the chunk, the trial, a variety
// and a site are found from the server's own pages. Each address is warmed with a few requests, then run
// by autocannon with PUBLIC_CONNECTIONS (default 10) for PUBLIC_SECONDS (default 5) seconds.
// Targets: each public address at least 40% of the floor's throughput, p95 under 50 ms.
import autocannon from "autocannon";
import { loadavg, availableParallelism } from "node:os";

const BASE = (process.env.BENCH_BASE_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "");
const CONNECTIONS = Number(process.env.PUBLIC_CONNECTIONS ?? 10);
const SECONDS = Number(process.env.PUBLIC_SECONDS ?? 5);
const MIN_RATIO = 0.4;
const MAX_P95_MS = 50;
const FLOOR_BYTES = 41 * 1024;

interface Run {
  name: string;
  path: string;
  perSecond: number;
  p50: number;
  p95: number;
  bytes: number;
  errors: number;
  cache: string;
}

async function text(path: string): Promise<string> {
  const res = await fetch(`${BASE}${path}`, { redirect: "manual" });
  if (!res.ok) throw new Error(`${path} answered ${res.status}`);
  return res.text();
}

/**
 * The floor of this server: the script chunk the home page loads from /_next/static whose size is nearest
 * 41 KB (the chunk the first measurements used), sent by Next straight from disk.
 */
async function staticChunk(): Promise<string> {
  const chunks = [...new Set([...(await text("/")).matchAll(/\/_next\/static\/[^"'\s]+?\.js/g)].map((m) => m[0]))];
  if (chunks.length === 0) throw new Error("The home page names no /_next/static script.");
  const sized = await Promise.all(chunks.map(async (c) => ({ c, n: (await (await fetch(`${BASE}${c}`)).arrayBuffer()).byteLength })));
  return sized.sort((a, b) => Math.abs(a.n - FLOOR_BYTES) - Math.abs(b.n - FLOOR_BYTES))[0]!.c;
}

async function measure(name: string, path: string): Promise<Run> {
  let cache = "-";
  for (let i = 0; i < 5; i += 1) {
    const res = await fetch(`${BASE}${path}`, { redirect: "manual" });
    await res.arrayBuffer();
    cache = res.headers.get("x-public-cache") ?? "-";
  }
  let errors = 0;
  const latencies: number[] = [];
  const instance = autocannon({ url: `${BASE}${path}`, connections: CONNECTIONS, duration: SECONDS, timeout: 30 });
  instance.on("response", (_client: unknown, status: number, _bytes: number, ms: number) => {
    latencies.push(ms);
    if (status >= 400) errors += 1;
  });
  const result = await instance;
  latencies.sort((a, b) => a - b);
  const at = (p: number) => Math.round(latencies[Math.min(latencies.length - 1, Math.ceil(p * latencies.length) - 1)] ?? NaN);
  return {
    name,
    path,
    perSecond: result.requests.total / SECONDS,
    p50: at(0.5),
    p95: at(0.95),
    bytes: result.requests.total ? result.throughput.total / result.requests.total : 0,
    errors: errors + result.errors + result.timeouts,
    cache,
  };
}

const { trials } = JSON.parse(await text("/api/public/v1/trials")) as { trials: { code: string }[] };
if (trials.length === 0) throw new Error("Nothing is published on this server; publish a trial first (npm run db:seed publishes TV26-LET).");
const code = trials.find((t) => t.code === "TV26-LET")?.code ?? trials[0]!.code;
const trialPage = await text(`/results/${code}`);
const variety = /href="(\/varieties\/\d+)"/.exec(trialPage)?.[1];
const site = /href="(\/sites\/\d+)"/.exec(trialPage)?.[1];
const chunk = await staticChunk();

console.log(`Public pages against ${BASE}: ${CONNECTIONS} connections, ${SECONDS} s each; load average ${loadavg()[0].toFixed(2)} on ${availableParallelism()} cores`);
const floor = await measure("static chunk (floor)", chunk);
const runs: Run[] = [];
const addresses: [string, string | undefined][] = [
  ["home page", "/"],
  ["results index", "/results"],
  ["trial page", `/results/${code}`],
  ["variety page", variety],
  ["site page", site],
  ["API trial list", "/api/public/v1/trials"],
  ["API trial", `/api/public/v1/trials/${code}`],
  ["API results", `/api/public/v1/trials/${code}/results`],
  ["API plots", `/api/public/v1/trials/${code}/plots`],
  ["older API address (redirect)", `/api/public/trials/${code}`],
];
for (const [name, path] of addresses) {
  if (path === undefined) {
    console.log(`${name}: no address found on the trial page; skipped`);
    continue;
  }
  runs.push(await measure(name, path));
}

const pad = (s: string, n: number) => s.padEnd(n);
console.log(`\n${pad("address", 60)} ${"req/s".padStart(8)} ${"of floor".padStart(9)} ${"p50".padStart(6)} ${"p95".padStart(6)} ${"KB".padStart(6)}  cache  errors`);
for (const r of [floor, ...runs]) {
  const ratio = r === floor ? "" : `${((r.perSecond / floor.perSecond) * 100).toFixed(0)}%`;
  console.log(
    `${pad(`${r.name} ${r.path}`, 60)} ${r.perSecond.toFixed(0).padStart(8)} ${ratio.padStart(9)} ${`${r.p50}`.padStart(6)} ${`${r.p95}`.padStart(6)} ${(r.bytes / 1024).toFixed(0).padStart(6)}  ${pad(r.cache, 5)}  ${r.errors}`,
  );
}
console.log(`\nload average after the run ${loadavg()[0].toFixed(2)}`);

const result = (figure: string, value: string, unit: string, ratio: string, target: string, met: string) => console.log(["RESULT", figure, value, unit, ratio, target, met].join("\t"));
result("static chunk (floor)", floor.perSecond.toFixed(0), "req/s", "1.00", "-", "-");
for (const r of runs) {
  const ratio = r.perSecond / floor.perSecond;
  result(`${r.name} ${r.path}, throughput`, r.perSecond.toFixed(0), "req/s", ratio.toFixed(2), `>= ${MIN_RATIO.toFixed(2)} of floor`, ratio >= MIN_RATIO && r.errors === 0 ? "met" : "not met");
  result(`${r.name} ${r.path}, p95`, String(r.p95), "ms", "-", `< ${MAX_P95_MS} ms`, r.p95 < MAX_P95_MS ? "met" : "not met");
}
