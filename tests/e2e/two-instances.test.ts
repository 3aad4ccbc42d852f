// Two `next start` processes of the test build on one MariaDB (their own database, seedplot_scale) and the
// fake S3 store, as a deployment behind a load balancer runs them. Everything is checked through HTTP and
// what the outside world sees (the database rows, the bucket, the fake SMTP capture), never through the
// instances' internals, so the checks hold whatever caches the instances keep.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import http from "node:http";
import { mkdtempSync, promises as fs } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, isNull, like, sql } from "drizzle-orm";
import sharp from "sharp";
import type { Browser } from "playwright-core";
import type { SMTPServer } from "smtp-server";
import { ListObjectsV2Command, S3Client } from "@aws-sdk/client-s3";
import * as s from "@/db/schema";
import { createDatabase } from "@/db/client";
import { runMigrations } from "@/db/migrate";
import { DEMO_PASSWORDS, DEMO_STAFF } from "@/db/demo-data";
import { startAppServer, type AppServer } from "../helpers/app-server";
import { launchBrowser, signIn } from "../helpers/browser";
import { sparePort } from "../helpers/ports";
import { startFakeSmtp } from "../../scripts/fake-smtp";

const root = path.resolve(import.meta.dirname, "../..");
const e2eUrl = process.env.E2E_DATABASE_URL ?? "";
if (!/seedplot_e2e/.test(e2eUrl)) throw new Error("The two-instance test needs E2E_DATABASE_URL (run scripts/test.sh).");
const scaleUrl = e2eUrl.replace(/\/seedplot_e2e(\?|$)/, "/seedplot_scale$1");
const work = mkdtempSync(path.join(tmpdir(), "seedplot-scale-"));
const mailbox = path.join(work, "mailbox");
const PUBLISHED = "TV26-SPN";
const GROWER = { email: "luis@brightwater.example", password: DEMO_PASSWORDS.cooperator };
const COORDINATOR = { email: DEMO_STAFF[1].email, password: DEMO_PASSWORDS.coordinator };

const { db, pool } = createDatabase(scaleUrl, 2);
const bucket = new S3Client({
  endpoint: process.env.S3_ENDPOINT,
  region: process.env.S3_REGION ?? "us-east-1",
  forcePathStyle: true,
  credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "", secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "" },
});
let smtp: SMTPServer;
let a: AppServer;
let b: AppServer;
let browser: Browser;
let photoBytes: Buffer;

beforeAll(async () => {
  if (process.env.STORAGE_DRIVER !== "s3" || !process.env.S3_ENDPOINT) throw new Error("The two-instance test needs the fake S3 store (run scripts/test.sh).");
  await runMigrations(scaleUrl);
  execFileSync(path.join(root, "node_modules/.bin/tsx"), ["db/seed.ts", "--reset"], { cwd: root, env: { ...process.env, DATABASE_URL: scaleUrl }, stdio: "ignore" });
  // Mail the seed queued is not this test's: only what the instances send from here on is counted.
  await db.update(s.mailOutbox).set({ status: "sent" }).where(eq(s.mailOutbox.status, "pending"));
  const smtpPort = await sparePort();
  smtp = await startFakeSmtp({ port: smtpPort, dir: mailbox });
  const instance = (name: string) => ({
    DATABASE_URL: scaleUrl,
    SEEDPLOT_DISABLE_JOBS: "0",
    INSTANCE_NAME: name,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(smtpPort),
    MAIL_MODE: "capture",
    MAILBOX_DIR: mailbox,
    MAIL_RETRY_SECONDS: "1",
    // Both instances look for due reminders a moment after they start: at the same minute.
    JOBS_FIRST_LOOK_SECONDS: "2",
  });
  [a, b] = await Promise.all([startAppServer(instance("instance-a")), startAppServer(instance("instance-b"))]);
  browser = await launchBrowser();
  photoBytes = await sharp({ create: { width: 64, height: 48, channels: 3, background: "orange" } }).jpeg().toBuffer();
}, 240_000);

afterAll(async () => {
  await Promise.all([a?.stop(), b?.stop()]);
  await browser?.close();
  await new Promise<void>((r) => (smtp ? smtp.close(() => r()) : r()));
  await pool.end();
  bucket.destroy();
  await fs.rm(work, { recursive: true, force: true });
});

/** Signs in on one instance through next-auth's credentials endpoint; the session cookie is valid on both. */
async function signInOn(server: AppServer, who: { email: string; password: string }) {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const pair = line.split(";", 1)[0]!;
      jar.set(pair.slice(0, pair.indexOf("=")), pair.slice(pair.indexOf("=") + 1));
    }
    return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  };
  const csrf = await fetch(`${server.base}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${server.base}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: keep(csrf) },
    body: new URLSearchParams({ csrfToken, email: who.email, password: who.password, json: "true" }),
  });
  const cookie = keep(res);
  if (!cookie.includes("session-token")) throw new Error(`sign-in on ${server.base} failed: ${res.status}`);
  return cookie;
}

async function brightwater() {
  const [row] = await db
    .select({ trialId: s.enrolments.trialId, siteId: s.enrolments.siteId })
    .from(s.enrolments)
    .innerJoin(s.trials, eq(s.trials.id, s.enrolments.trialId))
    .innerJoin(s.sites, eq(s.sites.id, s.enrolments.siteId))
    .where(and(eq(s.trials.code, "TV27-KAL"), eq(s.sites.name, "Brightwater Flower Farm")));
  return row!;
}

function photoForm(target: { trialId: number; siteId: number }, caption?: string) {
  const form = new FormData();
  if (caption) form.set("caption", caption);
  form.set("trialId", String(target.trialId));
  form.set("siteId", String(target.siteId));
  form.set("file", new Blob([new Uint8Array(photoBytes)], { type: "image/jpeg" }), "plot.jpg");
  return form;
}

async function storedObjects() {
  const out = await bucket.send(new ListObjectsV2Command({ Bucket: process.env.S3_BUCKET, Prefix: "photos/" }));
  return (out.Contents ?? []).map((o) => o.Key!).sort();
}

async function capturedMail() {
  const files = await fs.readdir(mailbox).catch(() => [] as string[]);
  return Promise.all(files.filter((f) => f.endsWith(".json")).map(async (f) => JSON.parse(await fs.readFile(path.join(mailbox, f), "utf8")) as { to: string[]; subject: string }));
}

const pendingMail = async () => (await db.select({ n: sql<number>`COUNT(*)` }).from(s.mailOutbox).where(eq(s.mailOutbox.status, "pending")))[0]!.n;
const publicTrial = async (server: AppServer) => fetch(`${server.base}/api/public/v1/trials/${PUBLISHED}`);
const publicPage = async (server: AppServer) => {
  const res = await fetch(`${server.base}/results/${PUBLISHED}`);
  return { status: res.status, html: await res.text() };
};

describe("two app instances on one database and one object store", () => {
  it("a reminder run on both at the same minute sends each reminder once", async () => {
    const looked = () => [a, b].map((x) => x.output().match(/\[jobs\] reminders: .*/g) ?? []).flat();
    await expect.poll(looked, { timeout: 90_000, interval: 250 }).toHaveLength(2);
    expect(looked().filter((line) => line.startsWith("[jobs] reminders: ran on"))).toHaveLength(1);
    expect(looked().filter((line) => line.includes("another instance has it"))).toHaveLength(1);
    await expect.poll(pendingMail, { timeout: 60_000, interval: 250 }).toBe(0);

    const today = new Date().toISOString().slice(0, 10);
    const reminded = await db
      .select({ enrolment: s.auditLog.entityId, n: sql<number>`COUNT(*)` })
      .from(s.auditLog)
      .where(and(eq(s.auditLog.action, "reminder.sent"), sql`JSON_VALUE(${s.auditLog.newValue}, '$.day') = ${today}`))
      .groupBy(s.auditLog.entityId);
    expect(reminded.length).toBeGreaterThan(0);
    expect(reminded.filter((r) => Number(r.n) !== 1)).toEqual([]);
    const reminders = (await capturedMail()).filter((m) => /^(Overdue counts|Counts due)/.test(m.subject));
    expect(reminders.length).toBeGreaterThan(0);
    const keys = reminders.map((m) => `${m.to.join(",")}|${m.subject}`);
    expect(new Set(keys).size).toBe(keys.length);
  }, 150_000);

  it("50 queued messages are sent exactly once between the two", async () => {
    await db.insert(s.mailOutbox).values(Array.from({ length: 50 }, (_, i) => ({ toAddress: `scale-${i}@example.test`, subject: `Scale check ${i}`, textBody: `Message ${i}` })));
    await expect.poll(pendingMail, { timeout: 60_000, interval: 250 }).toBe(0);
    const sent = await db.select({ subject: s.mailOutbox.subject, status: s.mailOutbox.status }).from(s.mailOutbox).where(like(s.mailOutbox.subject, "Scale check %"));
    expect(sent.filter((m) => m.status !== "sent")).toEqual([]);
    const captured = (await capturedMail()).filter((m) => m.subject.startsWith("Scale check "));
    expect(captured.map((m) => m.subject).sort()).toEqual(Array.from({ length: 50 }, (_, i) => `Scale check ${i}`).sort());
  }, 90_000);

  it("a photo uploaded on A is served by B, and deleting it on B removes it for A", async () => {
    const cookie = await signInOn(a, GROWER);
    const target = await brightwater();
    const uploaded = await fetch(`${a.base}/api/photos`, { method: "POST", headers: { Cookie: cookie, Origin: a.base }, body: photoForm(target, "Shared across instances") });
    expect(uploaded.status).toBe(200);
    const { id } = (await uploaded.json()) as { id: number };
    const served = await fetch(`${b.base}/api/photos/${id}`, { headers: { Cookie: cookie } });
    expect(served.status).toBe(200);
    expect(served.headers.get("content-type")).toBe("image/jpeg");
    const [row] = await db.select({ key: s.photos.storageKey }).from(s.photos).where(eq(s.photos.id, id));
    expect(await storedObjects()).toContain(row!.key);

    const onB = await browser.newContext({ baseURL: b.base });
    const page = await onB.newPage();
    await signIn(page, GROWER.email, GROWER.password);
    await page.goto(`/portal/record/${target.trialId}/${target.siteId}`);
    await page.getByRole("button", { name: "Remove photo: Shared across instances" }).click();
    await page.getByRole("dialog").getByRole("button", { name: "Remove photo" }).click();
    await expect.poll(async () => (await db.select({ id: s.photos.id }).from(s.photos).where(eq(s.photos.id, id))).length, { timeout: 30_000 }).toBe(0);
    await onB.close();
    expect((await fetch(`${a.base}/api/photos/${id}`, { headers: { Cookie: cookie } })).status).toBe(404);
    expect(await storedObjects()).not.toContain(row!.key);
  });

  it("a publish on A shows on B's next request; a withdrawal on B stops A's cached page at once", async () => {
    // Both instances have served (and may have cached) version 1.
    for (const server of [a, b]) {
      expect(((await (await publicTrial(server)).json()) as { version: number }).version).toBe(1);
      expect((await publicPage(server)).status).toBe(200);
    }
    const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, PUBLISHED));

    const onA = await browser.newContext({ baseURL: a.base });
    const pageA = await onA.newPage();
    await signIn(pageA, COORDINATOR.email, COORDINATOR.password);
    await pageA.goto(`/portal/trials/${trial!.id}/publish`);
    await pageA.getByLabel("What changed since the last version (required)").fill("Checked again after a late data correction.");
    const leaveOut = pageA.getByRole("checkbox", { name: /^Publish without/ });
    if (await leaveOut.count()) await leaveOut.check();
    await pageA.getByRole("button", { name: "Publish version 2" }).click();
    await pageA.getByText("Published as version 2.").waitFor({ timeout: 90_000 });
    await onA.close();

    expect(((await (await publicTrial(b)).json()) as { version: number }).version).toBe(2);
    expect((await publicPage(b)).html).toContain("Checked again after a late data correction.");
    // A now holds version 2 too.
    expect(((await (await publicTrial(a)).json()) as { version: number }).version).toBe(2);
    expect((await publicPage(a)).status).toBe(200);

    const onB = await browser.newContext({ baseURL: b.base });
    const pageB = await onB.newPage();
    await signIn(pageB, COORDINATOR.email, COORDINATOR.password);
    await pageB.goto(`/portal/trials/${trial!.id}/publish`);
    await pageB.getByLabel("Why are the results withdrawn?").fill("A labelling mix-up at one site is being checked.");
    await pageB.getByRole("button", { name: "Withdraw the results" }).click();
    // B has committed the withdrawal once no version of the trial is live.
    const live = async () => (await db.select({ n: sql<number>`COUNT(*)` }).from(s.publishedReports).where(and(eq(s.publishedReports.trialId, trial!.id), isNull(s.publishedReports.unpublishedAt))))[0]!.n;
    await expect.poll(live, { timeout: 60_000, interval: 100 }).toBe(0);
    await onB.close();

    const page = await publicPage(a);
    expect(page.html).toContain("These results have been withdrawn");
    expect(page.html).toContain("A labelling mix-up at one site is being checked.");
    expect((await publicTrial(a)).status).toBe(404);
    expect((await fetch(`${a.base}/results/${PUBLISHED}/data?format=csv`)).status).toBe(404);
  }, 180_000);

  it("reports each instance's health to a load balancer, and nothing more", async () => {
    const res = await fetch(`${b.base}/api/health`);
    expect(res.status).toBe(200);
    expect(res.headers.get("cache-control")).toBe("no-store");
    const health = (await res.json()) as Record<string, unknown>;
    expect(Object.keys(health).sort()).toEqual(["build", "database", "status", "storage"]);
    expect(health).toMatchObject({ status: "ok", database: "ok", storage: "ok" });
    expect(health.build).toBe((await fs.readFile(path.join(root, process.env.NEXT_DIST_DIR ?? ".next-test", "BUILD_ID"), "utf8")).trim());
  });

  it("killing A mid-upload leaves nothing half-written, and B keeps serving", async () => {
    const cookie = await signInOn(a, GROWER);
    const target = await brightwater();
    const kept = await fetch(`${b.base}/api/photos`, { method: "POST", headers: { Cookie: cookie, Origin: b.base }, body: photoForm(target) });
    expect(kept.status).toBe(200);
    const { id: keptId } = (await kept.json()) as { id: number };
    const photosBefore = await db.select({ id: s.photos.id }).from(s.photos);
    const objectsBefore = await storedObjects();

    // Half of a multipart upload reaches A, then A dies.
    const encoded = new Response(photoForm(target));
    const type = encoded.headers.get("content-type")!;
    const body = Buffer.from(await encoded.arrayBuffer());
    const url = new URL(`${a.base}/api/photos`);
    const req = http.request({ host: url.hostname, port: url.port, path: url.pathname, method: "POST", headers: { Cookie: cookie, Origin: a.base, "Content-Type": type, "Content-Length": String(body.length) } });
    const ended = new Promise<void>((r) => {
      req.on("error", () => r());
      req.on("response", () => r());
    });
    req.write(body.subarray(0, Math.floor(body.length / 2)));
    await new Promise((r) => setTimeout(r, 300));
    await a.kill();
    req.destroy();
    await ended;

    expect(await db.select({ id: s.photos.id }).from(s.photos)).toEqual(photosBefore);
    expect(await storedObjects()).toEqual(objectsBefore);
    expect((await fetch(`${b.base}/api/health`)).status).toBe(200);
    const served = await fetch(`${b.base}/api/photos/${keptId}`, { headers: { Cookie: cookie } });
    expect(served.status).toBe(200);
    expect((await publicPage(b)).status).toBe(200);
  }, 60_000);

  it("on SIGTERM an instance finishes the upload in progress, then stops", async () => {
    const cookie = await signInOn(b, GROWER);
    const target = await brightwater();
    const encoded = new Response(photoForm(target));
    const type = encoded.headers.get("content-type")!;
    const body = Buffer.from(await encoded.arrayBuffer());
    const url = new URL(`${b.base}/api/photos`);
    const answer = new Promise<{ status: number; text: string }>((resolve, reject) => {
      const req = http.request({ host: url.hostname, port: url.port, path: url.pathname, method: "POST", headers: { Cookie: cookie, Origin: b.base, "Content-Type": type, "Content-Length": String(body.length) } });
      req.on("error", reject);
      req.on("response", (res) => {
        let text = "";
        res.on("data", (d) => (text += d));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
      });
      req.write(body.subarray(0, Math.floor(body.length / 2)));
      setTimeout(() => {
        stopping = b.stop();
        setTimeout(() => req.end(body.subarray(Math.floor(body.length / 2))), 500);
      }, 300);
    });
    let stopping: Promise<void> = Promise.resolve();
    const done = await answer;
    expect([done.status, done.text]).toEqual([200, expect.stringContaining('"id"')]);
    const { id } = JSON.parse(done.text) as { id: number };
    const [row] = await db.select({ key: s.photos.storageKey }).from(s.photos).where(eq(s.photos.id, id));
    expect(await storedObjects()).toContain(row!.key);
    await stopping;
    expect(b.output()).toMatch(/\[shutdown\] SIGTERM/);
    await expect(fetch(`${b.base}/api/health`)).rejects.toThrow();
  }, 60_000);
});
