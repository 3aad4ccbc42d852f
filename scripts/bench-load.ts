// Load run against a running `next start` (it builds and starts nothing itself):
//   npm run bench:load                          # the demo server from scripts/up.sh on :3000, database from .env.local
//   LOAD_BASE_URL=http://127.0.0.1:3300 DATABASE_URL=mysql://... npm run bench:load
// DATABASE_URL must be the database that server uses: the script prepares data there (publishes TV26-LET
// if nothing is published, adds a throwaway trial with 50 sites and 50 cooperator accounts, removed at the
// end) and afterwards reads back every value it saved. Scenarios: the public trial page, the analysis API as a coordinator, and
// 50 growers saving values at the same time. Each is bounded by a request count and a time limit.
// Settings: LOAD_REQUESTS (per read scenario, default 400), LOAD_CONNECTIONS (default 10), LOAD_SAVES
// (saves per grower, default 20), LOAD_GROWERS (default 50), LOAD_SECONDS (time cap per scenario, default 60),
// LOAD_WARMUP_SAVES (saves per grower sent before the timed saves, default 0: a fresh server's first thousands
// of saves run partly unoptimised code; with a warm-up the timed saves measure the steady state, and the
// warm-up's own figures are printed on their own lines).
import { readFileSync } from "node:fs";
import { Agent, request } from "node:http";
import autocannon from "autocannon";
import { and, eq, inArray, isNull } from "drizzle-orm";
import { createDatabase } from "../db/client";
import * as s from "../db/schema";
import { addDays, todayIso } from "../lib/domain/schedule";
import { removeLeftoverTrials, removeThrowawayTrial } from "./throwaway-trial";

const BASE = (process.env.LOAD_BASE_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "");
const url = process.env.DATABASE_URL ?? "";
const REQUESTS = Number(process.env.LOAD_REQUESTS ?? 400);
const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 10);
const SAVES = Number(process.env.LOAD_SAVES ?? 20);
const WARMUP_SAVES = Number(process.env.LOAD_WARMUP_SAVES ?? 0);
const GROWERS = Number(process.env.LOAD_GROWERS ?? 50);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 60);
const PLOTS_PER_SITE = 20;
const PASSWORD = "seedplot-load-grower";
const COORDINATOR = { email: process.env.LOAD_COORDINATOR ?? "rosa.delgado@tamarack-valley.example", password: process.env.LOAD_COORDINATOR_PASSWORD ?? "seedplot-coordinator-demo" };

if (!url) {
  console.error("Set DATABASE_URL to the database the server at LOAD_BASE_URL uses (npm run bench:load reads .env.local).");
  process.exit(1);
}
const { db, pool } = createDatabase(url, 4);
const { hashPassword } = await import("../server/auth/password");
const { publishResults, readSiteInclusion } = await import("../server/publish/publish");
const { leftOutSiteIds } = await import("../lib/domain/publish/site-inclusion");
const { pool: appPool } = await import("../db/index");
// Everything the run adds is removed at the end (and at the start, if an earlier run was interrupted).
const THROWAWAY = { sitePrefix: "Load site ", cropPrefix: "Load crop ", emailPrefix: "load-" };

interface Figures {
  scenario: string;
  requests: number;
  seconds: number;
  errors: number;
  latencies: number[];
  note?: string;
}

const pct = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]! : NaN);

function print(f: Figures) {
  const sorted = [...f.latencies].sort((a, b) => a - b);
  const ms = (v: number) => `${v.toFixed(0)} ms`;
  console.log(
    `${f.scenario.padEnd(34)} ${String(f.requests).padStart(5)} req  ${(f.requests / f.seconds).toFixed(1).padStart(7)} req/s  ` +
      `p50 ${ms(pct(sorted, 50)).padStart(7)}  p95 ${ms(pct(sorted, 95)).padStart(7)}  p99 ${ms(pct(sorted, 99)).padStart(7)}  errors ${f.errors}${f.note ? `  (${f.note})` : ""}`,
  );
}

/**
 * CPU time (ms) used so far by this script and by each process named in LOAD_CPU_PIDS ("pid" or "name=pid",
 * comma-separated, e.g. the server and MariaDB), from /proc on Linux. On a shared machine throughput falls with the load; CPU per save does not.
 */
function processCpu(): Map<string, number> {
  const out = new Map<string, number>();
  // This script shares the machine's cores with the server: its own CPU per save is part of the picture.
  const own = process.cpuUsage();
  out.set("load generator", (own.user + own.system) / 1000);
  for (const item of (process.env.LOAD_CPU_PIDS ?? "").split(",").filter(Boolean)) {
    const [name, pid] = item.includes("=") ? item.split("=") : [item, item];
    try {
      const fields = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
      // utime and stime are fields 14 and 15 of the whole line, in clock ticks (100 per second on Linux).
      out.set(name!, ((Number(fields[11]) + Number(fields[12])) * 1000) / 100);
    } catch {
      // A pid that is gone or not on Linux: no figure for it.
    }
  }
  return out;
}

/** Statements MariaDB has run for all its clients so far (its Questions counter); the run's own two reads add two. */
async function statementsRun(): Promise<number> {
  const [rows] = (await pool.query("SHOW GLOBAL STATUS LIKE 'Questions'")) as unknown as [{ Value: string }[]];
  return Number(rows[0]!.Value);
}

// The saves go through node:http with kept-alive connections rather than fetch: this script shares the
// machine's two cores with the server and MariaDB, and fetch spent about twice the CPU per request.
const saveAgent = new Agent({ keepAlive: true, maxSockets: GROWERS });

/** POSTs a JSON body and reads the whole answer; resolves with the status code (30 s limit). */
function postJson(path: string, body: unknown, cookie: string): Promise<number> {
  const payload = Buffer.from(JSON.stringify(body));
  return new Promise((resolve, reject) => {
    const req = request(`${BASE}${path}`, {
      method: "POST",
      agent: saveAgent,
      timeout: 30_000,
      headers: { "Content-Type": "application/json", "Content-Length": payload.length, Cookie: cookie },
    });
    req.on("response", (res) => {
      res.on("data", () => {});
      res.on("end", () => resolve(res.statusCode ?? 0));
      res.on("error", reject);
    });
    req.on("timeout", () => req.destroy(new Error("timed out")));
    req.on("error", reject);
    req.end(payload);
  });
}

/** Cookie header value from a response's Set-Cookie lines, merged into what we already hold. */
function mergeCookies(jar: Map<string, string>, res: Response) {
  for (const line of res.headers.getSetCookie()) {
    const [pair] = line.split(";");
    const i = pair!.indexOf("=");
    jar.set(pair!.slice(0, i).trim(), pair!.slice(i + 1));
  }
  return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
}

/** Signs in through next-auth's credentials endpoint and returns the Cookie header of the session. */
async function signIn(email: string, password: string): Promise<string> {
  const jar = new Map<string, string>();
  const csrfRes = await fetch(`${BASE}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${BASE}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: mergeCookies(jar, csrfRes) },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const cookie = mergeCookies(jar, res);
  if (!/session-token=/.test(cookie)) throw new Error(`Sign-in failed for ${email} (HTTP ${res.status}); check the password and that the server uses DATABASE_URL.`);
  return cookie;
}

/** The published trial the public page shows; publishes TV26-LET when nothing is published yet. */
async function publishedTrial(coordinatorId: number) {
  const live = await db
    .select({ id: s.trials.id, code: s.trials.code })
    .from(s.publishedReports)
    .innerJoin(s.trials, eq(s.trials.id, s.publishedReports.trialId))
    .where(isNull(s.publishedReports.unpublishedAt))
    .limit(1);
  if (live[0]) return live[0];
  const [trial] = await db.select({ id: s.trials.id, code: s.trials.code }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  if (!trial) throw new Error("Nothing is published and TV26-LET is missing; publish a trial first.");
  const [u] = await db.select({ email: s.users.email, name: s.users.name, role: s.users.role }).from(s.users).where(eq(s.users.id, coordinatorId));
  const viewer = { id: coordinatorId, email: u!.email, name: u!.name, role: u!.role };
  const confirmedLeftOut = leftOutSiteIds((await readSiteInclusion(viewer, trial.id))!);
  await publishResults(viewer, { trialId: trial.id, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: null, confirmedLeftOut });
  console.log(`Published ${trial.code} so the public page has something to show.`);
  return trial;
}

/** A throwaway trial taking data, with one site, one enrolment and one cooperator per simulated grower. */
async function loadTrial(tag: string) {
  const [program] = await db.select({ id: s.programs.id }).from(s.programs).limit(1);
  const [season] = await db.select({ id: s.seasons.id }).from(s.seasons).where(eq(s.seasons.programId, program!.id)).limit(1);
  const [crop] = await db.insert(s.crops).values({ name: `Load crop ${tag}`, cropGroup: "leafy_greens" }).$returningId();
  const [trial] = await db
    .insert(s.trials)
    .values({ programId: program!.id, seasonId: season!.id, cropId: crop!.id, code: `LOAD-${tag}`, title: `Load run ${tag}`, blocks: 2, plotUnit: "bed_row", plotSize: 20, status: "collecting" })
    .$returningId();
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  await db.insert(s.trialTraits).values({ trialId: trial!.id, traitId: trait!.id, sortOrder: 0 });
  const entryIds: number[] = [];
  for (let i = 0; i < 10; i += 1) {
    const [v] = await db.insert(s.varieties).values({ programId: program!.id, cropId: crop!.id, name: `Load variety ${tag} ${i}` }).$returningId();
    const [e] = await db.insert(s.trialEntries).values({ trialId: trial!.id, varietyId: v!.id, blindCode: `L${i}${tag.slice(-2)}`, entryNumber: i + 1 }).$returningId();
    entryIds.push(e!.id);
  }
  // One hash for every grower: argon2 is deliberately slow and the password is the same.
  const passwordHash = await hashPassword(PASSWORD);
  const growers: { email: string; siteId: number; plotIds: number[] }[] = [];
  for (let g = 0; g < GROWERS; g += 1) {
    const email = `load-${tag}-${g}@example.test`.toLowerCase();
    const [u] = await db.insert(s.users).values({ email, name: `Load grower ${g}`, role: "cooperator", passwordHash }).$returningId();
    const [site] = await db.insert(s.sites).values({ programId: program!.id, name: `Load site ${tag} ${g}`, kind: "farm", region: "Valley", growingSetup: "field" }).$returningId();
    const [enrolment] = await db.insert(s.enrolments).values({ trialId: trial!.id, siteId: site!.id, cooperatorId: u!.id, sownOn: addDays(todayIso(), -30), randomisedAt: new Date() }).$returningId();
    await db.insert(s.plots).values(
      Array.from({ length: PLOTS_PER_SITE }, (_, i) => ({ enrolmentId: enrolment!.id, trialId: trial!.id, siteId: site!.id, entryId: entryIds[i % 10]!, plotCode: `G${g}P${i + 1}`, block: Math.floor(i / 10) + 1, position: (i % 10) + 1 })),
    );
    const plotRows = await db.select({ id: s.plots.id }).from(s.plots).where(eq(s.plots.enrolmentId, enrolment!.id));
    growers.push({ email, siteId: site!.id, plotIds: plotRows.map((p) => p.id) });
  }
  return { trialId: trial!.id, traitId: trait!.id, growers };
}

/** A read scenario through autocannon, keeping every response time so p95 can be reported. */
async function readScenario(scenario: string, path: string, headers: Record<string, string> = {}): Promise<Figures> {
  const latencies: number[] = [];
  let errors = 0;
  const started = performance.now();
  const instance = autocannon({ url: `${BASE}${path}`, connections: CONNECTIONS, amount: REQUESTS, duration: SECONDS, headers, timeout: 30 });
  instance.on("response", (_client: unknown, status: number, _bytes: number, ms: number) => {
    latencies.push(ms);
    if (status >= 400) errors += 1;
  });
  const result = await instance;
  errors += result.errors + result.timeouts;
  return { scenario, requests: latencies.length, seconds: (performance.now() - started) / 1000, errors, latencies };
}

const tag = `${Date.now().toString(36).slice(-6)}`;
console.log(`Load run against ${BASE} (tag ${tag})`);
for (const code of await removeLeftoverTrials(db, "LOAD-", THROWAWAY)) console.log(`Removed ${code}, left behind by an earlier run.`);
const [coordinator] = await db.select({ id: s.users.id }).from(s.users).where(eq(s.users.email, COORDINATOR.email));
if (!coordinator) throw new Error(`No coordinator ${COORDINATOR.email} in DATABASE_URL; set LOAD_COORDINATOR.`);
const published = await publishedTrial(coordinator.id);
const [yieldTrait] = await db
  .select({ id: s.traits.id })
  .from(s.trialTraits)
  .innerJoin(s.traits, eq(s.traits.id, s.trialTraits.traitId))
  .where(and(eq(s.trialTraits.trialId, published.id), eq(s.traits.code, "marketable_yield")));
const load = await loadTrial(tag);
let passed = false;
try {
  const coordinatorCookie = await signIn(COORDINATOR.email, COORDINATOR.password);
  // One at a time: each sign-in is an argon2 check, so on two cores parallel sign-ins finish no sooner.
  const growerCookies: string[] = [];
  for (const g of load.growers) growerCookies.push(await signIn(g.email, PASSWORD));
  console.log(`Prepared: public page /results/${published.code}, analysis of trial ${published.id}, ${load.growers.length} growers signed in.\n`);

  const figures: Figures[] = [];
  figures.push(await readScenario(`public page /results/${published.code}`, `/results/${published.code}`));
  figures.push(await readScenario("analysis API (coordinator)", `/api/trials/${published.id}/analysis${yieldTrait ? `?trait=${yieldTrait.id}` : ""}`, { cookie: coordinatorCookie }));

  // Saves: every grower saves SAVES times to its own plots at the same moment as the others. A save writes
  // three plots with values unique to (grower, save), so the last accepted value of each plot is known.
  const lastWritten = new Map<number, string>();
  /** Every grower sends `count` saves one after another, all growers at once; the phase's figures. */
  const saveRounds = async (first: number, count: number, scenario: string): Promise<Figures> => {
    const deadline = Date.now() + SECONDS * 1000;
    const latencies: number[] = [];
    let errors = 0;
    const started = performance.now();
    await Promise.all(
      load.growers.map(async (g, gi) => {
        for (let round = first; round < first + count && Date.now() < deadline; round += 1) {
          const plots = [0, 1, 2].map((k) => g.plotIds[(round * 3 + k) % g.plotIds.length]!);
          const values = plots.map((plotId, k) => ({ plotId, key: "marketable_yield", value: String(1000 + gi * 100 + round * 3 + k) }));
          const t0 = performance.now();
          try {
            const status = await postJson("/api/observations", { trialId: load.trialId, siteId: g.siteId, values }, growerCookies[gi]!);
            if (status === 200) for (const v of values) lastWritten.set(v.plotId, v.value!);
            else errors += 1;
          } catch {
            errors += 1;
          }
          latencies.push(performance.now() - t0);
        }
      }),
    );
    return { scenario, requests: latencies.length, seconds: (performance.now() - started) / 1000, errors, latencies, note: "3 values per save" };
  };
  // The warm-up's saves are real saves (checked row by row below) on a server whose save code has not run
  // yet: their figures are printed beside the timed ones, not left out of sight.
  const warmUp = WARMUP_SAVES > 0 ? await saveRounds(0, WARMUP_SAVES, `saves, warm-up (first ${WARMUP_SAVES * load.growers.length})`) : null;
  if (warmUp) figures.push(warmUp);
  const cpuBefore = processCpu();
  const statementsBefore = await statementsRun();
  const saves = await saveRounds(WARMUP_SAVES, SAVES, `observation saves (${load.growers.length} growers)`);
  const saveCount = saves.requests;
  const statementsPerSave = (await statementsRun()) - statementsBefore;
  const cpuPerSave = [...processCpu()].map(([pid, ms]) => `${pid} ${((ms - (cpuBefore.get(pid) ?? 0)) / Math.max(1, saveCount)).toFixed(1)} ms`);
  figures.push(saves);

  console.log("scenario                           requests    throughput   latency");
  for (const f of figures) print(f);
  if (cpuPerSave.length > 0) console.log(`CPU time per save (user + system, whatever the machine's load): ${cpuPerSave.join(", ")}`);
  console.log(`Statements MariaDB ran per save (round trips, whatever the load; counts every client of the database): ${(statementsPerSave / Math.max(1, saveCount)).toFixed(1)}`);

  // Every value a save was told was stored must be in the database, with the last value written to that plot.
  const stored = await db
    .select({ plotId: s.observations.plotId, value: s.observations.valueNumber })
    .from(s.observations)
    .where(and(inArray(s.observations.plotId, [...lastWritten.keys()]), eq(s.observations.traitId, load.traitId)));
  const byPlot = new Map(stored.map((r) => [r.plotId, r.value]));
  const wrong = [...lastWritten].filter(([plotId, value]) => byPlot.get(plotId) !== Number(value));
  console.log(`\nRow-by-row check: ${lastWritten.size} plots saved, ${stored.length} rows found, ${wrong.length} lost or stale.`);
  for (const [plotId, value] of wrong.slice(0, 10)) console.log(`  plot ${plotId}: expected ${value}, found ${byPlot.get(plotId) ?? "nothing"}`);
  passed = wrong.length === 0 && figures.every((f) => f.errors === 0);

  // One line per figure for `npm run bench` (tab-separated: figure, value, unit, ratio, target, met).
  const perSecond = saves.requests / saves.seconds;
  const p95 = pct([...saves.latencies].sort((a, b) => a - b), 95);
  const result = (figure: string, value: string, unit: string, target: string, met: boolean) => console.log(["RESULT", figure, value, unit, "-", target, met ? "met" : "not met"].join("\t"));
  const steady = warmUp ? ` (after ${warmUp.requests} warm-up saves)` : " (fresh server)";
  result(`saves, ${load.growers.length} growers x 3 values${steady}`, perSecond.toFixed(0), "saves/s", ">= 200 saves/s", perSecond >= 200);
  result(`saves p95${steady}`, p95.toFixed(0), "ms", "< 200 ms", p95 < 200);
  if (warmUp) {
    const info = (figure: string, value: string, unit: string) => console.log(["RESULT", figure, value, unit, "-", "-", "-"].join("\t"));
    info(`saves during the warm-up (the server's first ${warmUp.requests})`, (warmUp.requests / warmUp.seconds).toFixed(0), "saves/s");
    info("saves p95 during the warm-up", pct([...warmUp.latencies].sort((a, b) => a - b), 95).toFixed(0), "ms");
  }
  console.log(["RESULT", "database statements per save", (statementsPerSave / Math.max(1, saveCount)).toFixed(1), "statements", "-", "-", "-"].join("\t"));
  result("saved plot values lost or stale (row by row)", String(wrong.length), "plots", "0, and no failed save", wrong.length === 0 && saves.errors === 0 && (warmUp?.errors ?? 0) === 0);
} finally {
  await removeThrowawayTrial(db, load.trialId, THROWAWAY);
  console.log(`Removed the throwaway trial LOAD-${tag} with its ${load.growers.length} sites and grower accounts.`);
}
saveAgent.destroy();
await pool.end();
await appPool.end();
process.exit(passed ? 0 : 1);
