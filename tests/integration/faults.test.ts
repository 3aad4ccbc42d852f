// Faults: a server killed during a large save and the mail server being down. Runs against its own database
// (seedplot_fault) because the mail test drains the whole outbox. MariaDB itself restarting under a running
// app is tests/e2e/db-restart.test.ts, which needs a server of its own.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawn, execFileSync, type ChildProcess } from "node:child_process";
import { mkdtempSync, writeFileSync, promises as fs } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq, inArray, like, sql } from "drizzle-orm";
import type { SMTPServer } from "smtp-server";
import mysql from "mysql2/promise";
import * as s from "@/db/schema";
import { createDatabase } from "@/db/client";
import { runMigrations } from "@/db/migrate";
import { bigSiteCsv, insertBigSite } from "../helpers/big-site";
import { sparePort } from "../helpers/ports";
import { unique } from "../helpers/db";
import { startFakeSmtp } from "../../scripts/fake-smtp";
import { addDays, todayIso } from "@/lib/domain/schedule";

const base = process.env.TEST_DATABASE_URL ?? process.env.DATABASE_URL ?? "";
if (!/seedplot_test/.test(base)) throw new Error("Fault tests need TEST_DATABASE_URL pointing at seedplot_test (run scripts/test.sh).");
const faultUrl = base.replace(/\/seedplot_test(\?|$)/, "/seedplot_fault$1");
const ROWS = 10_000;
const VALUES = ROWS * 3;
const root = path.resolve(import.meta.dirname, "../..");
const work = mkdtempSync(path.join(tmpdir(), "seedplot-fault-"));

const { db, pool } = createDatabase(faultUrl, 4);
let smtpPort: number;
let app: {
  appPool: typeof import("@/db/index").pool;
  issuePasswordReset: typeof import("@/server/auth/password-reset").issuePasswordReset;
  deliverSoon: typeof import("@/server/mail/outbox").deliverSoon;
  deliverPendingMail: typeof import("@/server/mail/outbox").deliverPendingMail;
  claimPendingMail: typeof import("@/db/mutations/mail").claimPendingMail;
};

beforeAll(async () => {
  await runMigrations(faultUrl);
  // Demo data gives the traits the big site records and a coordinator for the mail test; --reset keeps reruns clean.
  execFileSync(path.join(root, "node_modules/.bin/tsx"), ["db/seed.ts", "--reset"], { cwd: root, env: { ...process.env, DATABASE_URL: faultUrl }, stdio: "ignore" });
  smtpPort = await sparePort();
  // The app modules read settings once on import, so they are pointed at this database and the spare mail port first.
  process.env.DATABASE_URL = faultUrl;
  process.env.SMTP_PORT = String(smtpPort);
  process.env.MAILBOX_DIR = path.join(work, "mailbox");
  const [index, passwordReset, outbox, mail] = await Promise.all([
    import("@/db/index"),
    import("@/server/auth/password-reset"),
    import("@/server/mail/outbox"),
    import("@/db/mutations/mail"),
  ]);
  app = {
    appPool: index.pool,
    issuePasswordReset: passwordReset.issuePasswordReset,
    deliverSoon: outbox.deliverSoon,
    deliverPendingMail: outbox.deliverPendingMail,
    claimPendingMail: mail.claimPendingMail,
  };
});

afterAll(async () => {
  await app?.appPool.end().catch(() => undefined);
  await pool.end();
  await fs.rm(work, { recursive: true, force: true });
});

/** Runs the commit worker in its own process group so SIGKILL takes tsx and its node child together. */
function startWorker(job: object) {
  const jobPath = path.join(work, `job-${Date.now()}.json`);
  writeFileSync(jobPath, JSON.stringify(job));
  const child = spawn(path.join(root, "node_modules/.bin/tsx"), ["--conditions", "react-server", "tests/helpers/commit-worker.ts", jobPath], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: faultUrl, SEEDPLOT_DISABLE_JOBS: "1" },
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code, signal) => resolve(signal ? null : code)));
  return { child, exited, output: () => out };
}

const killGroup = (child: ChildProcess) => {
  try {
    process.kill(-child.pid!, "SIGKILL");
  } catch {
    // Already gone: nothing left to kill.
  }
};

describe("a server killed in the middle of a 10,000-row save", () => {
  it("leaves all of the sheet or none of it, and the same sheet saves in full afterwards", async () => {
    const site = await insertBigSite(db, { plots: ROWS, tag: unique("kill"), sownOn: addDays(todayIso(), -30) });
    const csvPath = path.join(work, "big.csv");
    writeFileSync(csvPath, bigSiteCsv(site));
    const job = { viewer: site.viewer, trialId: site.trialId, siteId: site.siteId, csvPath };
    const plotsOf = `SELECT id FROM plots WHERE enrolment_id = ${site.enrolmentId}`;
    // A dirty read sees rows the save has written but not committed, which is the moment to kill it.
    const watcher = await mysql.createConnection({ uri: faultUrl });
    await watcher.query("SET SESSION TRANSACTION ISOLATION LEVEL READ UNCOMMITTED");
    const uncommitted = async () => {
      const [rows] = await watcher.query(`SELECT COUNT(*) AS n FROM observations WHERE plot_id IN (${plotsOf})`);
      return Number((rows as { n: number }[])[0]!.n);
    };

    const first = startWorker(job);
    let seenMidway = 0;
    let exitCode: number | null = -1;
    let finished = false;
    void first.exited.then(() => (finished = true));
    try {
      while (!finished) {
        const n = await uncommitted();
        // A third of the way in, so the transaction holds many batches of rows when it dies.
        if (n >= VALUES / 3) {
          seenMidway = n;
          killGroup(first.child);
          break;
        }
        await new Promise((r) => setTimeout(r, 10));
      }
      exitCode = await first.exited;
    } finally {
      killGroup(first.child);
      await watcher.end();
    }
    // The kill has to land inside the transaction, or this test proves nothing.
    expect(seenMidway, first.output()).toBeGreaterThan(0);
    expect(exitCode, "the worker ended by itself instead of being killed").toBeNull();

    const committed = async () => {
      const [rows] = (await db.execute(sql.raw(`SELECT COUNT(*) AS n FROM observations WHERE plot_id IN (${plotsOf})`))) as unknown as [[{ n: number }]];
      return Number(rows[0]!.n);
    };
    const audits = async () => {
      const [rows] = (await db.execute(sql.raw(`SELECT COUNT(*) AS n FROM audit_log WHERE trial_id = ${site.trialId}`))) as unknown as [[{ n: number }]];
      return Number(rows[0]!.n);
    };
    // MariaDB rolls the dead connection's transaction back; until then its row locks make this read wait.
    const afterKill = await committed();
    console.log(`killed with ${seenMidway} of ${VALUES} values written but not committed; ${afterKill} committed after the kill`);
    expect([0, VALUES]).toContain(afterKill);
    expect([0, VALUES]).toContain(await audits());

    // "Restarting the server": a fresh process saves the same sheet.
    const second = startWorker(job);
    const code = await second.exited;
    expect(code, second.output()).toBe(0);
    expect(second.output()).toContain(afterKill === 0 ? `"saved":${VALUES}` : `"saved":0`);
    expect(await committed()).toBe(VALUES);
    expect(await audits()).toBe(VALUES);
  }, 60_000);
});

describe("the mail server being down", () => {
  it("lets the action succeed, keeps the message queued, and sends it once the server is back", async () => {
    const mailbox = process.env.MAILBOX_DIR!;
    let smtp: SMTPServer = await startFakeSmtp({ port: smtpPort, dir: mailbox });
    await new Promise<void>((resolve) => smtp.close(() => resolve()));

    const [coordinator] = await db.select({ email: s.users.email, name: s.users.name }).from(s.users).where(eq(s.users.role, "coordinator")).limit(1);
    // The reset link carries this token, so it tells this message apart from any other.
    const token = unique("tok");
    const thisMessage = like(s.mailOutbox.textBody, `%${token}%`);
    const queued = await app.issuePasswordReset({ email: coordinator!.email, token });
    expect(queued).toBe(true);
    await expect(app.deliverSoon()).resolves.toBeUndefined();
    const [pending] = await db.select().from(s.mailOutbox).where(thisMessage);
    expect(pending).toMatchObject({ status: "pending", attempts: 1 });
    expect(pending!.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(await fs.readdir(mailbox).catch(() => [])).toEqual([]);

    smtp = await startFakeSmtp({ port: smtpPort, dir: mailbox });
    try {
      // What the 30-second retry job calls.
      expect(await app.deliverPendingMail()).toBeGreaterThanOrEqual(1);
    } finally {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
    }
    const [sent] = await db.select().from(s.mailOutbox).where(thisMessage);
    expect(sent).toMatchObject({ status: "sent", attempts: 2, lastError: null });
    const files = await fs.readdir(mailbox);
    const messages = await Promise.all(files.map(async (f) => JSON.parse(await fs.readFile(path.join(mailbox, f), "utf8")) as { to: string[]; text: string }));
    expect(messages.filter((m) => m.text.includes(token) && m.to.includes(coordinator!.email))).toHaveLength(1);
  });
});

describe("delivery runs at the same time", () => {
  // After each action, the retry timer, and each server process all deliver queued mail; they overlap.
  async function queue(count: number) {
    const subject = unique("Overlap");
    const to = Array.from({ length: count }, (_, i) => `${subject.toLowerCase()}-${i}@example.org`);
    await db.insert(s.mailOutbox).values(to.map((toAddress) => ({ toAddress, subject, textBody: "Hello" })));
    const rows = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).where(eq(s.mailOutbox.subject, subject));
    return { subject, to, ids: rows.map((r) => r.id) };
  }

  it("a message claimed by a run that is still sending is not claimed by another", async () => {
    const { ids } = await queue(2);
    const first = (await app.claimPendingMail(50, 20)).map((r) => r.id);
    const second = (await app.claimPendingMail(50, 20)).map((r) => r.id);
    expect(ids.every((id) => first.includes(id))).toBe(true);
    expect(ids.filter((id) => second.includes(id))).toEqual([]);
    await db.update(s.mailOutbox).set({ status: "sent" }).where(inArray(s.mailOutbox.id, ids));
  });

  it("send each queued message once", async () => {
    const { subject, to } = await queue(8);
    const mailbox = path.join(work, "overlap-mailbox");
    const smtp = await startFakeSmtp({ port: smtpPort, dir: mailbox });
    try {
      const sent = await Promise.all([app.deliverPendingMail(), app.deliverPendingMail(), app.deliverPendingMail()]);
      expect(sent.reduce((a, b) => a + b, 0)).toBe(to.length);
    } finally {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
    }
    const files = await fs.readdir(mailbox);
    const received = await Promise.all(files.map(async (f) => JSON.parse(await fs.readFile(path.join(mailbox, f), "utf8")) as { to: string[]; subject: string }));
    expect(received.filter((m) => m.subject === subject).flatMap((m) => m.to).sort()).toEqual([...to].sort());
  });
});
