// MariaDB restarted under a running app: a MariaDB of this file's own and a `next start` of the test build
// pointed at it. The database is stopped cleanly and, later, killed; while it is away every request has to
// answer at once with a plain message, and once it is back the same server has to answer normally again.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawn, execFile, type ChildProcess } from "node:child_process";
import { existsSync, mkdtempSync, promises as fs } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { and, eq } from "drizzle-orm";
import mysql from "mysql2/promise";
import type { Browser, BrowserContext, Page } from "playwright-core";
import * as s from "@/db/schema";
import { createDatabase } from "@/db/client";
import { runMigrations } from "@/db/migrate";
import { DEMO_PASSWORDS } from "@/db/demo-data";
import { DB_UNAVAILABLE_MESSAGE } from "@/lib/errors";
import { SIGN_IN_UNAVAILABLE } from "@/lib/domain/sign-in-messages";
import { startPrivateMariadb } from "../helpers/private-mariadb";
import { sparePort } from "../helpers/ports";
import { launchBrowser } from "../helpers/browser";
import { demoSite } from "../helpers/demo";

const root = path.resolve(import.meta.dirname, "../..");
const distDir = process.env.NEXT_DIST_DIR ?? ".next-test";
const GROWER = "tomas@willowbend.example";
// A request that has not answered in this long counts as hanging; outage answers come back in milliseconds.
const HANG_MS = 15_000;

const work = mkdtempSync(path.join(tmpdir(), "seedplot-restart-"));
let maria: Awaited<ReturnType<typeof startPrivateMariadb>>;
let next: ChildProcess;
let nextExited = false;
let nextLog = "";
let base = "";
let cookie = "";
let browser: Browser | null = null;
let site: { trialId: number; siteId: number; plotId: number; traitId: number };

async function signIn(email: string, password: string) {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const pair = line.split(";", 1)[0]!;
      const i = pair.indexOf("=");
      jar.set(pair.slice(0, i), pair.slice(i + 1));
    }
    return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  };
  const csrf = await fetch(`${base}/api/auth/csrf`, { signal: AbortSignal.timeout(HANG_MS) });
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(`${base}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    signal: AbortSignal.timeout(HANG_MS),
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: keep(csrf) },
    body: new URLSearchParams({ csrfToken, email, password, json: "true" }),
  });
  const cookies = keep(response);
  const body = (await response.json()) as { url?: string };
  return { signedIn: /session-token=/.test(cookies), cookies, error: new URL(body.url ?? base).searchParams.get("error") };
}

/** One request to the app under test; a hang fails the test instead of stalling it. */
async function call(p: string, init: RequestInit = {}) {
  const headers = new Headers(init.headers);
  if (cookie) headers.set("Cookie", cookie);
  const response = await fetch(`${base}${p}`, { ...init, headers, redirect: "manual", signal: AbortSignal.timeout(HANG_MS) });
  return { status: response.status, headers: response.headers, text: await response.text() };
}

const save = (value: string) =>
  call("/api/observations", {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ trialId: site.trialId, siteId: site.siteId, values: [{ plotId: site.plotId, key: "seeds_sown", value }] }),
  });

/** What the database holds for the plot's seeds sown, read on a connection of its own. */
async function storedValue() {
  const c = await mysql.createConnection({ uri: maria.url });
  try {
    const [rows] = await c.query("SELECT value_number AS v FROM observations WHERE plot_id = ? AND trait_id = ? AND occasion = 0", [site.plotId, site.traitId]);
    const row = (rows as { v: string | number | null }[])[0];
    return row ? Number(row.v) : null;
  } finally {
    await c.end();
  }
}

/** The answers a database outage must give: the API a 503 in JSON, pages a 5xx, saves a 503 that wrote nothing. */
async function expectOutageAnswers() {
  const api = await call("/api/public/v1/trials");
  expect(api.status).toBe(503);
  expect(api.headers.get("retry-after")).toBe("30");
  const body = JSON.parse(api.text) as { error: string; code: string };
  expect(body).toMatchObject({ code: "db_unavailable", error: DB_UNAVAILABLE_MESSAGE });

  const saving = await save("42");
  expect(saving.status).toBe(503);
  expect(JSON.parse(saving.text)).toMatchObject({ code: "db_unavailable", error: DB_UNAVAILABLE_MESSAGE });

  for (const p of ["/results", "/portal", "/portal/record"]) {
    const page = await call(p);
    expect([p, page.status]).toEqual([p, 500]);
    // Internals stay in the server log: no SQL, driver codes or stack in what the browser receives.
    expect(page.text).not.toMatch(/ECONNREFUSED|PROTOCOL_CONNECTION_LOST|select `|at async/);
  }

  const attempt = await signIn(GROWER, DEMO_PASSWORDS.cooperator);
  expect(attempt.signedIn).toBe(false);
  expect(attempt.error).toBe(SIGN_IN_UNAVAILABLE);
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitFor(what: string, check: () => boolean | Promise<boolean>, limitMs: number) {
  const deadline = Date.now() + limitMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`Gave up waiting for ${what}`);
    await sleep(50);
  }
}

beforeAll(async () => {
  if (!existsSync(path.join(root, distDir, "BUILD_ID"))) throw new Error(`No test build in ${distDir}; run through scripts/test.sh, which builds it.`);
  const [dbPort, appPort] = [await sparePort(), await sparePort()];
  maria = await startPrivateMariadb({ dir: work, port: dbPort, database: "seedplot_restart", user: "seedplot", password: "seedplot_restart_pw" });
  await runMigrations(maria.url);
  await promisify(execFile)(path.join(root, "node_modules/.bin/tsx"), ["db/seed.ts", "--reset"], { cwd: root, env: { ...process.env, DATABASE_URL: maria.url } });
  const { db, pool } = createDatabase(maria.url, 1);
  try {
    const demo = await demoSite(db, "TV27-KAL", "Willow Bend Farm");
    site = { trialId: demo.trialId, siteId: demo.siteId, plotId: demo.plots[0]!.id, traitId: demo.traitId.seeds_sown! };
    // Leaves the plot without a value so the first save below is the only one there is.
    await db.delete(s.observations).where(and(eq(s.observations.plotId, site.plotId), eq(s.observations.traitId, site.traitId)));
  } finally {
    await pool.end();
  }

  base = `http://localhost:${appPort}`;
  const mailPort = await sparePort();
  next = spawn(path.join(root, "node_modules/.bin/next"), ["start", "-H", "127.0.0.1", "-p", String(appPort)], {
    cwd: root,
    // Its own process group, so stopping it also stops whatever next starts.
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
    env: {
      ...process.env,
      NODE_ENV: "production",
      NEXT_DIST_DIR: distDir,
      NEXT_TELEMETRY_DISABLED: "1",
      DATABASE_URL: maria.url,
      APP_URL: base,
      NEXTAUTH_URL: base,
      NEXTAUTH_SECRET: "seedplot-restart-test-secret-0123456789",
      // Nothing listens here: mail stays queued, which the outbox already tolerates.
      SMTP_PORT: String(mailPort),
      MAILBOX_DIR: path.join(work, "mailbox"),
      STORAGE_DIR: path.join(work, "storage"),
      MAIL_MODE: "capture",
    },
  });
  next.stdout!.on("data", (d) => (nextLog += d));
  next.stderr!.on("data", (d) => (nextLog += d));
  next.once("exit", () => (nextExited = true));
  await waitFor(
    "next start to answer",
    async () => {
      if (nextExited) throw new Error(`next start exited:\n${nextLog}`);
      return fetch(`${base}/`, { signal: AbortSignal.timeout(2000) }).then((r) => r.ok, () => false);
    },
    60_000,
  );
  const session = await signIn(GROWER, DEMO_PASSWORDS.cooperator);
  if (!session.signedIn) throw new Error(`sign-in failed before the outage: ${session.error}`);
  cookie = session.cookies;
});

afterAll(async () => {
  await browser?.close().catch(() => undefined);
  if (next && !nextExited) {
    try {
      process.kill(-next.pid!, "SIGTERM");
    } catch {
      // Already gone.
    }
    await waitFor("next start to stop", () => nextExited, 10_000).catch(() => {
      try {
        process.kill(-next.pid!, "SIGKILL");
      } catch {
        // Already gone.
      }
    });
  }
  await maria?.stop("SIGKILL");
  await fs.rm(work, { recursive: true, force: true });
});

/** A browser tab signed in as the grower (the session cookie is a JWT, so it stays valid through the outage). */
async function tab(): Promise<{ context: BrowserContext; page: Page }> {
  browser ??= await launchBrowser();
  const context = await browser.newContext({ baseURL: base, viewport: { width: 1280, height: 900 } });
  await context.addCookies(
    cookie.split("; ").map((pair) => {
      const i = pair.indexOf("=");
      return { name: pair.slice(0, i), value: pair.slice(i + 1), url: base };
    }),
  );
  return { context, page: await context.newPage() };
}

describe("MariaDB stopped and started again under a running next start", () => {
  it("answers plainly while it is stopped, and normally once it is back, without restarting the app", async () => {
    const appPid = next.pid;
    expect((await call("/api/public/v1/trials")).status).toBe(200);
    expect((await call("/results")).status).toBe(200);
    expect((await call("/portal")).status).toBe(200);
    const saved = await save("41");
    expect([saved.status, saved.text]).toEqual([200, expect.stringContaining('"ok":true')]);
    expect(await storedValue()).toBe(41);

    // A visitor already reading the site when the database goes away moves on inside the open tab.
    const visitor = await tab();
    expect((await visitor.page.goto("/"))?.status()).toBe(200);

    await maria.stop("SIGTERM");
    await expectOutageAnswers();

    // What people see: the page's own message in place of the content, with a way to try again.
    const message = (p: Page) => p.getByRole("alert").filter({ hasText: "could not load" }).textContent({ timeout: HANG_MS });
    await visitor.page.getByRole("link", { name: "Results", exact: true }).click();
    await expect(message(visitor.page)).resolves.toMatch(/This page could not load.*trouble reaching its data/);
    const reader = await tab();
    expect((await reader.page.goto("/results"))?.status()).toBe(500);
    await expect(message(reader.page)).resolves.toMatch(/This page could not load.*trouble reaching its data/);
    // The portal's own layout reads the account from the database, so the message comes from the app-wide page.
    const grower = await tab();
    expect((await grower.page.goto("/portal"))?.status()).toBe(500);
    await expect(message(grower.page)).resolves.toMatch(/This page could not load.*Nothing you saved earlier is lost/);

    await maria.start();
    expect(next.pid).toBe(appPid);
    expect(nextExited).toBe(false);
    expect((await call("/api/public/v1/trials")).status).toBe(200);
    expect((await call("/results")).status).toBe(200);
    expect((await call("/portal")).status).toBe(200);
    // The refused save left the earlier value alone; a new one goes through.
    expect(await storedValue()).toBe(41);
    expect((await save("43")).status).toBe(200);
    expect(await storedValue()).toBe(43);
    const again = await signIn(GROWER, DEMO_PASSWORDS.cooperator);
    expect(again.signedIn).toBe(true);

    // "Try again" fetches the page afresh instead of showing the failure it already holds.
    for (const [who, heading] of [[visitor, "Variety trial results"], [reader, "Variety trial results"], [grower, "Hello, Tomas"]] as const) {
      await who.page.getByRole("button", { name: "Try again" }).click();
      await who.page.getByRole("heading", { level: 1, name: heading }).waitFor({ timeout: HANG_MS });
      await who.context.close();
    }
  }, 120_000);

  it("answers 503 from the moment mysqld is killed until it has recovered, then 200 on the very next request", async () => {
    const appPid = next.pid;
    const seen: { startedAt: number; endedAt: number; status: number | "failed" }[] = [];
    let polling = true;
    // A client asking again and again, as a busy server would be asked, across the kill and the restart.
    const poller = (async () => {
      while (polling) {
        const startedAt = Date.now();
        const status = await call("/api/public/v1/trials").then((r) => r.status, () => "failed" as const);
        seen.push({ startedAt, endedAt: Date.now(), status });
        await sleep(25);
      }
    })();
    const after = (t: number) => seen.filter((x) => x.startedAt >= t);
    try {
      await waitFor("answers before the kill", () => seen.filter((x) => x.status === 200).length >= 3, 20_000);
      await maria.stop("SIGKILL");
      const killedAt = Date.now();
      await waitFor("answers during the outage", () => after(killedAt).length >= 10, 30_000);
      await expectOutageAnswers();

      // Requests between these two moments may meet either a server still starting or one already up.
      const restartAt = Date.now();
      await maria.start();
      const backAt = Date.now();
      await waitFor("answers after the restart", () => after(backAt).length >= 5, 30_000);
      polling = false;
      await poller;

      const statuses = new Set(seen.map((x) => x.status));
      expect([...statuses].sort()).toEqual([200, 503]);
      expect(after(killedAt).filter((x) => x.startedAt < restartAt).every((x) => x.status === 503)).toBe(true);
      expect(after(backAt).map((x) => x.status)).toEqual(after(backAt).map(() => 200));
      // Figures for the operations notes, not assertions.
      const outage = seen.filter((x) => x.status === 503);
      const firstBack = after(backAt)[0]!;
      console.log(
        `mysqld killed: ${outage.length} requests answered 503 over ${((outage.at(-1)!.startedAt - killedAt) / 1000).toFixed(1)} s ` +
          `(slowest ${Math.max(...outage.map((x) => x.endedAt - x.startedAt))} ms); MariaDB restarted in ${((backAt - restartAt) / 1000).toFixed(1)} s; ` +
          `first request after it answered: ${firstBack.status} in ${firstBack.endedAt - firstBack.startedAt} ms`,
      );
    } finally {
      polling = false;
      await poller;
    }

    expect(next.pid).toBe(appPid);
    expect(nextExited).toBe(false);
    // Committed before the crash, so InnoDB's recovery keeps it.
    expect(await storedValue()).toBe(43);
    expect((await call("/portal")).status).toBe(200);
    expect((await save("44")).status).toBe(200);
    expect(await storedValue()).toBe(44);
  }, 120_000);
});
