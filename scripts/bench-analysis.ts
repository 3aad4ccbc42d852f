// Analysis API latency against a running `next start` (it builds and starts nothing itself):
//   npm run bench:analysis                      # the demo server from scripts/up.sh on :3000, database from .env.local
//   BENCH_BASE_URL=http://127.0.0.1:3300 DATABASE_URL=mysql://... npm run bench:analysis
// DATABASE_URL must be the database that server uses: the script adds a throwaway trial there (code ANBENCH-*,
// 50 sites x 40 entries x 4 blocks, yield plus seed counts, every site accepted), signs in as the coordinator and
// times GET /api/trials/<id>/analysis over loopback: the first request after the data appeared (computed), plain
// repeats (served from the server's cache), conditional repeats answering 304, requests straight after one value
// was edited (new data version, computed again), the analysis page once the result is cached (its HTML size, and
// how much of it is the RSC flight data) and one site's section as the page fetches it when opened. It then times
// the same steps in-process (settings and data version, database read, each step of the calculation, the viewer's
// shape, JSON) and removes the trial, also any left behind by an interrupted earlier run.
// Settings: BENCH_SITES / BENCH_ENTRIES / BENCH_BLOCKS (default 50 / 40 / 4), BENCH_REPEATS (cached and 304
// requests, default 20), BENCH_CHANGES (edit-then-request rounds, default 5), BENCH_SECONDS (overall cap, default 300),
// BENCH_SERVER_PID (the `next-server` process: its CPU time per computed request is printed too, steadier than the
// wall-clock time on a busy machine; Linux only).
import http from "node:http";
import { readFileSync } from "node:fs";
import { brotliDecompressSync, gunzipSync, inflateSync } from "node:zlib";
import { and, eq, inArray } from "drizzle-orm";
import { createDatabase } from "../db/client";
import * as s from "../db/schema";
import { addDays, todayIso } from "../lib/domain/schedule";
import { removeLeftoverTrials, removeThrowawayTrial } from "./throwaway-trial";

const BASE = (process.env.BENCH_BASE_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "");
const url = process.env.DATABASE_URL ?? "";
const SITES = Number(process.env.BENCH_SITES ?? 50);
const ENTRIES = Number(process.env.BENCH_ENTRIES ?? 40);
const BLOCKS = Number(process.env.BENCH_BLOCKS ?? 4);
const REPEATS = Number(process.env.BENCH_REPEATS ?? 20);
const CHANGES = Number(process.env.BENCH_CHANGES ?? 5);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 300);
const COORDINATOR = { email: process.env.BENCH_COORDINATOR ?? "rosa.delgado@tamarack-valley.example", password: process.env.BENCH_COORDINATOR_PASSWORD ?? "seedplot-coordinator-demo" };
const PREFIX = "ANBENCH-";
const SERVER_PID = process.env.BENCH_SERVER_PID ? Number(process.env.BENCH_SERVER_PID) : null;

/** The server's CPU time so far (user + system) in ms, or null without BENCH_SERVER_PID. */
function serverCpuMs(): number | null {
  if (SERVER_PID === null) return null;
  // fields after the command name: state is field 3, utime 14, stime 15 (clock ticks, 100 per second on Linux)
  const fields = readFileSync(`/proc/${SERVER_PID}/stat`, "utf8").split(") ")[1]!.split(" ");
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100;
}

if (!url) {
  console.error("Set DATABASE_URL to the database the server at BENCH_BASE_URL uses (npm run bench:analysis reads .env.local).");
  process.exit(1);
}
const deadline = Date.now() + SECONDS * 1000;
const { db, pool } = createDatabase(url, 4);

// ---------------------------------------------------------------- HTTP

interface Timed {
  status: number;
  ms: number;
  /** bytes on the wire (compressed when the server compressed) */
  wire: number;
  /** bytes of the decoded body */
  raw: number;
  encoding: string | null;
  etag: string | null;
  body: Buffer;
}

// One kept-alive socket, as a browser tab reuses its connection; the time runs to the last body byte.
const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });

function get(path: string, headers: Record<string, string> = {}): Promise<Timed> {
  if (Date.now() > deadline) throw new Error(`Stopped after BENCH_SECONDS=${SECONDS}.`);
  return new Promise((resolve, reject) => {
    const started = performance.now();
    const req = http.get(`${BASE}${path}`, { agent, headers: { "accept-encoding": "gzip, deflate, br", ...headers }, timeout: 120_000 }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("error", reject);
      res.on("end", () => {
        const ms = performance.now() - started;
        const wire = Buffer.concat(chunks);
        const encoding = res.headers["content-encoding"] ?? null;
        const body = encoding === "gzip" ? gunzipSync(wire) : encoding === "br" ? brotliDecompressSync(wire) : encoding === "deflate" ? inflateSync(wire) : wire;
        resolve({ status: res.statusCode ?? 0, ms, wire: wire.length, raw: body.length, encoding, etag: (res.headers.etag as string | undefined) ?? null, body });
      });
    });
    req.on("timeout", () => req.destroy(new Error(`${path} took over 120 s`)));
    req.on("error", reject);
  });
}

/** Signs in through next-auth's credentials endpoint and returns the Cookie header of the session. */
async function signIn(email: string, password: string): Promise<string> {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const i = pair!.indexOf("=");
      jar.set(pair!.slice(0, i).trim(), pair!.slice(i + 1));
    }
    return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  };
  const csrfRes = await fetch(`${BASE}/api/auth/csrf`);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${BASE}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: keep(csrfRes) },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const cookie = keep(res);
  if (!/session-token=/.test(cookie)) throw new Error(`Sign-in failed for ${email} (HTTP ${res.status}); check the password and that the server uses DATABASE_URL.`);
  return cookie;
}

// ---------------------------------------------------------------- figures

const pct = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
const kib = (bytes: number) => (bytes >= 1024 * 1024 ? `${(bytes / 1024 / 1024).toFixed(2)} MiB` : `${(bytes / 1024).toFixed(1)} KiB`);

function line(label: string, samples: number[], extra = "") {
  const sorted = [...samples].sort((a, b) => a - b);
  const figures = sorted.length === 1 ? `${sorted[0]!.toFixed(0)} ms` : `median ${pct(sorted, 50).toFixed(0)} ms  p95 ${pct(sorted, 95).toFixed(0)} ms  (n=${sorted.length})`;
  console.log(`${label.padEnd(44)} ${figures}${extra ? `  ${extra}` : ""}`);
}

const sizes = (t: Timed) => `${t.raw.toLocaleString("en")} bytes (${kib(t.raw)})${t.encoding ? `, ${t.encoding} on the wire ${t.wire.toLocaleString("en")} bytes (${kib(t.wire)})` : ", not compressed"}`;

// ---------------------------------------------------------------- data

function lcg(seed: number) {
  let state = seed >>> 0;
  return () => (state = (1664525 * state + 1013904223) >>> 0) / 2 ** 32;
}

const THROWAWAY = { sitePrefix: "Analysis bench site ", cropPrefix: "Analysis bench " };

/** A trial of SITES x ENTRIES x BLOCKS with yield (1% missing with a reason) and seed counts, every site accepted. */
async function createTrial(tag: string, coordinatorId: number) {
  const [membership] = await db.select({ programId: s.programCoordinators.programId }).from(s.programCoordinators).where(eq(s.programCoordinators.userId, coordinatorId)).limit(1);
  if (!membership) throw new Error(`${COORDINATOR.email} coordinates no program.`);
  const [season] = await db.select({ id: s.seasons.id }).from(s.seasons).where(eq(s.seasons.programId, membership.programId)).limit(1);
  if (!season) throw new Error("The coordinator's program has no season.");
  const traitRows = await db.select({ id: s.traits.id, code: s.traits.code }).from(s.traits).where(inArray(s.traits.code, ["marketable_yield", "seeds_sown", "emerged_final"]));
  const traitId = Object.fromEntries(traitRows.map((t) => [t.code, t.id])) as Record<"marketable_yield" | "seeds_sown" | "emerged_final", number>;
  if (traitRows.length !== 3) throw new Error("The trait library lacks marketable_yield, seeds_sown or emerged_final; load the demo data first.");

  const [crop] = await db.insert(s.crops).values({ name: `Analysis bench ${tag}`, cropGroup: "leafy_greens" }).$returningId();
  const [trial] = await db
    .insert(s.trials)
    .values({ programId: membership.programId, seasonId: season.id, cropId: crop!.id, code: `${PREFIX}${tag}`, title: `Analysis benchmark ${tag} (throwaway)`, blocks: BLOCKS, plotUnit: "bed_row", plotSize: 20, status: "analysing" })
    .$returningId();
  const trialId = trial!.id;
  await db.insert(s.trialTraits).values([
    { trialId, traitId: traitId.seeds_sown, sortOrder: 0 },
    { trialId, traitId: traitId.emerged_final, sortOrder: 1 },
    { trialId, traitId: traitId.marketable_yield, sortOrder: 2 },
  ]);
  const entryIds: number[] = [];
  for (let i = 0; i < ENTRIES; i += 1) {
    const [v] = await db.insert(s.varieties).values({ programId: membership.programId, cropId: crop!.id, name: `Bench variety ${i + 1}` }).$returningId();
    const [e] = await db.insert(s.trialEntries).values({ trialId, varietyId: v!.id, blindCode: `B${String(i + 1).padStart(3, "0")}`, entryNumber: i + 1, isCheck: i === 0 }).$returningId();
    entryIds.push(e!.id);
  }
  const random = lcg(20260401);
  const plotRows: (typeof s.plots.$inferInsert)[] = [];
  for (let site = 0; site < SITES; site += 1) {
    const [siteRow] = await db.insert(s.sites).values({ programId: membership.programId, name: `Analysis bench site ${tag} ${site + 1}`, kind: "farm", region: "Valley", growingSetup: "field" }).$returningId();
    const [enrolment] = await db.insert(s.enrolments).values({ trialId, siteId: siteRow!.id, sownOn: addDays(todayIso(), -70), randomisedAt: new Date() }).$returningId();
    await db.insert(s.submissions).values({ enrolmentId: enrolment!.id, status: "accepted", submittedAt: new Date(), reviewedAt: new Date() });
    for (let block = 1; block <= BLOCKS; block += 1) {
      const order = entryIds.map((id) => ({ id, key: random() })).sort((a, b) => a.key - b.key);
      order.forEach(({ id }, i) => plotRows.push({ enrolmentId: enrolment!.id, trialId, siteId: siteRow!.id, entryId: id, plotCode: `S${site + 1}-${block}${String(i + 1).padStart(2, "0")}`, block, position: i + 1 }));
    }
  }
  for (let i = 0; i < plotRows.length; i += 2000) await db.insert(s.plots).values(plotRows.slice(i, i + 2000));
  const plots = await db.select({ id: s.plots.id, siteId: s.plots.siteId, entryId: s.plots.entryId }).from(s.plots).where(eq(s.plots.trialId, trialId));
  const siteEffect = new Map<number, number>();
  const obs: (typeof s.observations.$inferInsert)[] = [];
  for (const p of plots) {
    if (!siteEffect.has(p.siteId)) siteEffect.set(p.siteId, 600 * (random() - 0.5));
    const entry = entryIds.indexOf(p.entryId);
    const missing = random() < 0.01;
    const value = Math.round((2000 + siteEffect.get(p.siteId)! + 6 * entry + 300 * (random() - 0.5)) * 10) / 10;
    obs.push({ plotId: p.id, traitId: traitId.marketable_yield, valueNumber: missing ? null : value, missingReason: missing ? "animal_damage" : null });
    obs.push({ plotId: p.id, traitId: traitId.seeds_sown, valueNumber: 20 });
    obs.push({ plotId: p.id, traitId: traitId.emerged_final, valueNumber: Math.round(13 + 6 * random()) });
  }
  for (let i = 0; i < obs.length; i += 2000) await db.insert(s.observations).values(obs.slice(i, i + 2000));
  return { trialId, traitId: traitId.marketable_yield, plots: plots.length, observations: obs.length };
}

// ---------------------------------------------------------------- run

const tag = Date.now().toString(36).slice(-6);
let trialId: number | null = null;
let failed = false;
try {
  for (const code of await removeLeftoverTrials(db, PREFIX, THROWAWAY)) console.log(`Removed ${code}, left behind by an interrupted run.`);
  const [coordinator] = await db.select({ id: s.users.id, email: s.users.email, name: s.users.name, role: s.users.role }).from(s.users).where(eq(s.users.email, COORDINATOR.email));
  if (!coordinator) throw new Error(`No coordinator ${COORDINATOR.email} in DATABASE_URL; set BENCH_COORDINATOR.`);
  const cookie = await signIn(COORDINATOR.email, COORDINATOR.password);

  // Warm the route (code loading, database pool) on a demo trial, so the first timed request is the analysis alone.
  const [demo] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  if (demo) await get(`/api/trials/${demo.id}/analysis`, { cookie });

  let t = performance.now();
  const trial = await createTrial(tag, coordinator.id);
  trialId = trial.trialId;
  console.log(`Analysis API against ${BASE}: trial ${PREFIX}${tag}, ${SITES} sites x ${ENTRIES} entries x ${BLOCKS} blocks = ${trial.plots} plots, ${trial.observations} observations (added in ${((performance.now() - t) / 1000).toFixed(1)} s)\n`);
  const path = `/api/trials/${trialId}/analysis?trait=${trial.traitId}`;
  const expectStatus = (r: Timed, status: number, what: string) => {
    if (r.status !== status) throw new Error(`${what}: expected HTTP ${status}, got ${r.status}: ${r.body.toString("utf8").slice(0, 300)}`);
  };

  const cpuBefore = serverCpuMs();
  const cold = await get(path, { cookie });
  const coldCpu = cpuBefore === null ? null : serverCpuMs()! - cpuBefore;
  expectStatus(cold, 200, "first request");
  const parsed = JSON.parse(cold.body.toString("utf8")) as { combined: { sites: number; n: number } | null; perSite: unknown[] };
  if (parsed.combined?.sites !== SITES) throw new Error(`The combined analysis covers ${parsed.combined?.sites ?? 0} sites, not ${SITES}.`);

  const cached: number[] = [];
  for (let i = 0; i < REPEATS; i += 1) {
    const r = await get(path, { cookie });
    expectStatus(r, 200, "repeat");
    if (r.etag !== cold.etag) throw new Error("The ETag changed although the data did not.");
    cached.push(r.ms);
  }
  const notModified: number[] = [];
  for (let i = 0; i < REPEATS; i += 1) {
    const r = await get(path, { cookie, "if-none-match": cold.etag! });
    expectStatus(r, 304, "conditional repeat");
    notModified.push(r.ms);
  }

  // One yield value edited per round, as a grower correcting a plot would; always to a new value, so no
  // round can land on an earlier round's version (timestamps have whole-second resolution).
  const [target] = await db
    .select({ id: s.observations.id, value: s.observations.valueNumber })
    .from(s.observations)
    .innerJoin(s.plots, eq(s.plots.id, s.observations.plotId))
    .where(and(eq(s.plots.trialId, trialId), eq(s.observations.traitId, trial.traitId)))
    .limit(1);
  const changed: number[] = [];
  const changedCpu: number[] = [];
  let etag = cold.etag;
  for (let i = 0; i < CHANGES; i += 1) {
    await db.update(s.observations).set({ valueNumber: target!.value! + (i + 1) / 2 }).where(eq(s.observations.id, target!.id));
    const before = serverCpuMs();
    const r = await get(path, { cookie, "if-none-match": etag! });
    if (before !== null) changedCpu.push(serverCpuMs()! - before);
    expectStatus(r, 200, "request after an edit");
    if (r.etag === etag) throw new Error("The ETag did not change after an edit.");
    etag = r.etag;
    changed.push(r.ms);
  }
  const withPlots = await get(`${path}&plots=1`, { cookie });
  expectStatus(withPlots, 200, "request with plot rows");
  // The page embeds its slim first view (lib/domain/analysis/page-view) for its first paint.
  const page: Timed[] = [];
  for (let i = 0; i < 3; i += 1) {
    const r = await get(`/portal/trials/${trialId}/analysis?trait=${trial.traitId}`, { cookie, accept: "text/html" });
    expectStatus(r, 200, "analysis page");
    page.push(r);
  }

  const firstSite = (parsed.perSite[0] as { siteId: number }).siteId;
  const siteSection = await get(`/api/trials/${trialId}/analysis/sites/${firstSite}?trait=${trial.traitId}`, { cookie });
  expectStatus(siteSection, 200, "one site's section");

  line("first request after the data appeared", [cold.ms], `computed${coldCpu === null ? "" : `; server CPU ${coldCpu.toFixed(0)} ms`}`);
  line("repeat, same settings", cached, "200 from the server's cache");
  line("repeat with If-None-Match", notModified, "304, version check only");
  line("first request after one value edited", changed, "computed again");
  if (changedCpu.length > 0) line("  server CPU for each of those", changedCpu, "(10 ms resolution)");
  console.log(`\nresponse ${sizes(cold)}`);
  console.log(`with raw plot rows (&plots=1): ${sizes(withPlots)}`);
  line("\nanalysis page, analysis already cached", page.map((p) => p.ms), `HTML ${sizes(page[0]!)}`);
  const html = page[0]!.body.toString("utf8");
  // The RSC flight data (the props the page hands its client components) rides in inline scripts beside the rendered HTML.
  const flight = [...html.matchAll(/<script[^>]*>self\.__next_f\.push\(([\s\S]*?)\)<\/script>/g)].reduce((n, m) => n + m[1]!.length, 0);
  console.log(`  of which RSC flight data in inline scripts: ${kib(flight)}; rendered markup and the rest: ${kib(html.length - flight)}`);
  line("one site's section, as the page opens it", [siteSection.ms], sizes(siteSection));
  if (process.env.BENCH_SAVE_PAGE) (await import("node:fs")).writeFileSync(process.env.BENCH_SAVE_PAGE, html);

  // The same work in-process, step by step, to show where the cold time goes. Imported late: it opens the app's own pool.
  const { loadPreparedInput, prepareAnalysis } = await import("../server/analysis/load-analysis");
  const { toPageView } = await import("../lib/domain/analysis/page-view");
  const { runAnalysis } = await import("../lib/domain/analysis/run");
  const { analysisFor } = await import("../lib/domain/analysis/blind");
  const { pool: appPool } = await import("../db/index");
  const viewer = { id: coordinator.id, email: coordinator.email, name: coordinator.name, role: coordinator.role };
  const steps = new Map<string, number[]>();
  const time = (name: string, ms: number) => steps.set(name, [...(steps.get(name) ?? []), ms]);
  let bytes = 0;
  let pageBytes = 0;
  for (let i = 0; i < 3 && Date.now() < deadline; i += 1) {
    t = performance.now();
    const prepared = await prepareAnalysis(viewer, trialId, { trait: trial.traitId });
    time("access, settings and data version (queries)", performance.now() - t);
    t = performance.now();
    const input = await loadPreparedInput(prepared!);
    time("load: database read of plots and observations", performance.now() - t);
    t = performance.now();
    const result = runAnalysis(input, { traitId: trial.traitId, siteIds: null, includeUnaccepted: false, siteModel: "random", separation: "lsd" }, { onStep: (name, ms) => time(`  analysis: ${name}`, ms) });
    time("analysis, all steps", performance.now() - t);
    t = performance.now();
    const view = analysisFor(viewer, result, false);
    time("shape for the viewer (no plot rows)", performance.now() - t);
    t = performance.now();
    bytes = JSON.stringify(view).length;
    time("serialise: JSON of what the API sends", performance.now() - t);
    t = performance.now();
    pageBytes = JSON.stringify(toPageView(view)).length;
    time("the page's first view, as JSON", performance.now() - t);
  }
  await appPool.end();
  console.log("\nin-process, same trial (3 runs; the first is the coldest):");
  for (const [name, samples] of steps) line(`  ${name}`, samples, name.startsWith("serialise") ? kib(bytes) : name.startsWith("the page") ? kib(pageBytes) : "");

  // One line per figure for `npm run bench` (tab-separated: figure, value, unit, ratio, target, met).
  const pageKib = page[0]!.raw / 1024;
  const result = (figure: string, value: string, unit: string, target: string, met: boolean) => console.log(["RESULT", figure, value, unit, "-", target, met ? "met" : "not met"].join("\t"));
  result(`first analysis, ${SITES} x ${ENTRIES} x ${BLOCKS}, uncached over HTTP`, cold.ms.toFixed(0), "ms", "< 300 ms", cold.ms < 300);
  if (coldCpu !== null) console.log(["RESULT", "server CPU time of that first analysis", coldCpu.toFixed(0), "ms", "-", "-", "-"].join("\t"));
  result("analysis page HTML for that trial", pageKib.toFixed(0), "KiB", "< 500 KB", page[0]!.raw < 500 * 1000);
} catch (e) {
  failed = true;
  console.error(e instanceof Error ? e.message : e);
} finally {
  if (trialId !== null) {
    await removeThrowawayTrial(db, trialId, THROWAWAY);
    console.log(`\nRemoved the throwaway trial ${PREFIX}${tag}.`);
  }
  agent.destroy();
  await pool.end();
}
process.exit(failed ? 1 : 0);
