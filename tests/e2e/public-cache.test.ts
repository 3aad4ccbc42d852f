import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, desc, eq, gt, isNull, like } from "drizzle-orm";
import type { Browser } from "playwright-core";
import * as s from "@/db/schema";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";
import type { Viewer } from "@/lib/domain/viewer";
import { startAppServer, type AppServer } from "../helpers/app-server";
import { launchBrowser } from "../helpers/browser";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { credentialsSignIn } from "../helpers/http";

// Public pages and open data answers are kept in each app instance's memory, tagged with the database's
// public generation stamp. Two instances of the real server share the integration database here; the
// publication and withdrawal run in this process, as a third instance would. Whatever either instance
// had kept, the next request after the change must show it, on every public address.

const { withdrawResults, publishResults } = await import("@/server/publish/publish");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const CODE = DEMO_TRIALS.find((t) => t.publishedAtSeed)!.code;
const SETTINGS = { siteModel: "random", separation: "lsd" } as const;

let a: AppServer;
let b: AppServer;
let browser: Browser;
let coordinator: Viewer;
let trialId: number;
let varietyPages: string[];
let sitePages: string[];

const get = (server: AppServer, path: string, headers: Record<string, string> = {}) => fetch(new URL(path, server.base), { headers, redirect: "manual" });
const cacheOf = (res: Response) => res.headers.get("x-public-cache");

/** Every public address that shows the trial: its page, the open data API (and the older address), the lists, and its variety and site pages. */
const trialAddresses = () => [`/results/${CODE}`, `/api/public/v1/trials/${CODE}`, `/api/public/v1/trials/${CODE}/results`, `/api/public/v1/trials/${CODE}/plots`];
const listAddresses = ["/", "/results", "/api/public/v1/trials"];

async function liveVersion(): Promise<number> {
  const [row] = await db
    .select({ version: s.publishedReports.version })
    .from(s.publishedReports)
    .where(and(eq(s.publishedReports.trialId, trialId), isNull(s.publishedReports.unpublishedAt)))
    .orderBy(desc(s.publishedReports.version))
    .limit(1);
  return row!.version;
}

async function republish(note: string) {
  const [lastMail] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  await publishResults(coordinator, { trialId, traitId: null, settings: SETTINGS, changeNote: note, confirmedLeftOut: await leftOut() });
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, lastMail?.id ?? 0), like(s.mailOutbox.subject, "Results published:%")));
}

async function leftOut(): Promise<number[]> {
  const { readSiteInclusion } = await import("@/server/publish/publish");
  const { leftOutSiteIds } = await import("@/lib/domain/publish/site-inclusion");
  return leftOutSiteIds((await readSiteInclusion(coordinator, trialId))!);
}

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, CODE));
  trialId = trial!.id;
  const settings = { DATABASE_URL: process.env.TEST_DATABASE_URL ?? process.env.DATABASE_URL };
  [a, b] = await Promise.all([startAppServer(settings), startAppServer(settings)]);
  const page = await (await get(a, `/results/${CODE}`)).text();
  varietyPages = [...new Set([...page.matchAll(/href="(\/varieties\/\d+)"/g)].map((m) => m[1]!))];
  sitePages = [...new Set([...page.matchAll(/href="(\/sites\/\d+)"/g)].map((m) => m[1]!))];
  browser = await launchBrowser();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await Promise.all([a?.stop(), b?.stop()]);
  await pool.end();
  await appPool.end();
});

describe("the public cache", () => {
  it("a withdrawn trial answers the withdrawal notice at once on every public address of every instance, though each had it cached just before; a new version is served at once", async () => {
    expect(varietyPages.length).toBeGreaterThan(0);
    expect(sitePages.length).toBeGreaterThan(0);
    const before = await liveVersion();
    for (const server of [a, b]) {
      for (const path of [...trialAddresses(), ...listAddresses, ...varietyPages, ...sitePages]) {
        await (await get(server, path)).arrayBuffer();
        const again = await get(server, path);
        expect([server.base, path, again.status, cacheOf(again)]).toEqual([server.base, path, 200, "hit"]);
        await again.arrayBuffer();
      }
    }

    // No public answer may be reused by a browser or shared cache without asking first: the report PDF
    // and the open data answers say so, and a client holding the report's tag is answered 304 while the
    // version stands.
    const report = `/results/${CODE}/report`;
    const pdf = await get(a, report);
    expect([pdf.status, pdf.headers.get("content-type"), pdf.headers.get("cache-control")]).toEqual([200, "application/pdf", "public, no-cache"]);
    await pdf.arrayBuffer();
    const reportTag = pdf.headers.get("etag")!;
    expect(reportTag).toMatch(/^".+"$/);
    for (const server of [a, b]) expect([server.base, (await get(server, report, { "If-None-Match": reportTag })).status]).toEqual([server.base, 304]);
    for (const path of trialAddresses().slice(1)) {
      const res = await get(a, path);
      await res.arrayBuffer();
      expect([path, res.headers.get("cache-control")]).toEqual([path, "public, no-cache"]);
    }

    await withdrawResults(coordinator, { trialId, reason: "A labelling mix-up at one site is being checked." });
    try {
      for (const server of [a, b]) expect([server.base, (await get(server, report, { "If-None-Match": reportTag })).status]).toEqual([server.base, 404]);
      for (const server of [a, b]) {
        const page = await get(server, `/results/${CODE}`);
        expect(page.status).toBe(200);
        const html = await page.text();
        expect([server.base, html.includes("These results have been withdrawn"), html.includes("A labelling mix-up at one site is being checked.")]).toEqual([server.base, true, true]);
        for (const path of trialAddresses().slice(1)) expect([server.base, path, (await get(server, path)).status]).toEqual([server.base, path, 404]);
        const older = await fetch(new URL(`/api/public/trials/${CODE}`, server.base));
        expect(older.status).toBe(404);
        for (const path of listAddresses) expect([server.base, path, await (await get(server, path)).text()]).not.toContainEqual(expect.stringContaining(`/results/${CODE}"`));
        const index = (await (await get(server, "/api/public/v1/trials")).json()) as { trials: { code: string }[] };
        expect(index.trials.map((t) => t.code)).not.toContain(CODE);
        // the trial's varieties and sites no longer show it (a page only it made public is gone)
        for (const path of [...varietyPages, ...sitePages]) {
          const res = await get(server, path);
          const body = await res.text();
          expect([server.base, path, res.status === 404 || !body.includes(`/results/${CODE}"`)]).toEqual([server.base, path, true]);
        }
      }
    } finally {
      await republish("Published again after the cache check.");
    }

    const now = await liveVersion();
    expect(now).toBe(before + 1);
    for (const server of [a, b]) {
      const api = (await (await get(server, `/api/public/v1/trials/${CODE}`)).json()) as { version: number };
      expect([server.base, api.version]).toEqual([server.base, now]);
      const html = await (await get(server, `/results/${CODE}`)).text();
      const shows = (text: string) => [server.base, text, html.includes(text)];
      expect(shows("These results have been withdrawn")).toEqual([server.base, "These results have been withdrawn", false]);
      expect(shows(`version ${now}, published`)).toEqual([server.base, `version ${now}, published`, true]);
      expect(shows("Published again after the cache check.")).toEqual([server.base, "Published again after the cache check.", true]);
    }
  }, 120_000);

  it("a signed-in cooperator's or coordinator's pages are never served from the shared cache nor stored in it", async () => {
    const grower = DEMO_SITES.find((site) => site.grower)!.grower!;
    const viewers = [
      { email: grower.email, password: DEMO_PASSWORDS.cooperator, path: "/results?crop=Spinach" },
      { email: DEMO_STAFF[1].email, password: DEMO_PASSWORDS.coordinator, path: "/results?season=Spring%202026" },
    ];
    for (const viewer of viewers) {
      const signedIn = await credentialsSignIn(viewer.email, viewer.password, {}, a.base);
      expect(signedIn.signedIn).toBe(true);
      const cookie = { Cookie: signedIn.session.cookie };
      // The signed-in viewer comes first: what they are shown must not be kept for anyone.
      const theirs = await get(a, viewer.path, cookie);
      expect([theirs.status, cacheOf(theirs)]).toEqual([200, null]);
      expect((await theirs.text()).includes("My portal")).toBe(true);
      const anonymous = await get(a, viewer.path);
      expect(cacheOf(anonymous)).toBe("miss");
      const anonymousHtml = await anonymous.text();
      expect([anonymousHtml.includes("My portal"), anonymousHtml.includes(">Sign in<")]).toEqual([false, true]);
      // ... and once the anonymous copy is kept, the signed-in viewer still gets their own page.
      expect(cacheOf(await get(a, viewer.path))).toBe("hit");
      const again = await get(a, viewer.path, cookie);
      expect(cacheOf(again)).toBeNull();
      expect((await again.text()).includes("My portal")).toBe(true);
      for (const path of ["/portal", `/api/public/v1/trials/${CODE}`]) {
        const res = await get(a, path, cookie);
        expect([path, cacheOf(res)]).toEqual([path, null]);
        if (path === "/portal") expect(res.headers.get("cache-control")).toMatch(/private.*no-store|no-store.*private/);
        await res.arrayBuffer();
      }
    }
  }, 90_000);

  it("a cached page carries a fresh nonce and a CSP with no 'unsafe-inline' script in each answer, and hydrates in chromium with no CSP violation", async () => {
    const path = `/results/${CODE}`;
    await (await get(a, path)).arrayBuffer();
    const nonces: string[] = [];
    for (let i = 0; i < 2; i += 1) {
      const res = await get(a, path);
      expect(cacheOf(res)).toBe("hit");
      const policy = res.headers.get("content-security-policy")!;
      const scripts = /script-src ([^;]+)/.exec(policy)![1]!;
      expect(scripts).not.toContain("unsafe-inline");
      expect(scripts).toContain("'strict-dynamic'");
      const nonce = /'nonce-([^']+)'/.exec(scripts)![1]!;
      const html = await res.text();
      const scriptNonces = new Set([...html.matchAll(/<script[^>]*\snonce="([^"]+)"/g)].map((m) => m[1]));
      expect([...scriptNonces]).toEqual([nonce]);
      for (const other of (res.headers.get("link") ?? "").matchAll(/nonce="([^"]+)"/g)) expect(other[1]).toBe(nonce);
      nonces.push(nonce);
    }
    expect(nonces[0]).not.toBe(nonces[1]);

    const context = await browser.newContext({ baseURL: a.base });
    const page = await context.newPage();
    const violations: string[] = [];
    page.on("console", (m) => {
      if (/Content Security Policy/i.test(m.text())) violations.push(m.text());
    });
    await page.addInitScript(() => document.addEventListener("securitypolicyviolation", (e) => console.error(`Content Security Policy violation: ${e.violatedDirective} ${e.blockedURI}`)));
    const response = await page.goto(path);
    expect(response!.headers()["x-public-cache"]).toBe("hit");
    await page.getByRole("heading", { name: "Summary for growers" }).waitFor();
    // Hydrated: the header's Results link navigates inside the page (client router), keeping this marker.
    await page.evaluate(() => ((window as unknown as { stayed: boolean }).stayed = true));
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Results" }).click();
    await page.waitForURL(/\/results$/);
    await page.getByRole("heading", { name: "Variety trial results" }).waitFor();
    expect(await page.evaluate(() => (window as unknown as { stayed?: boolean }).stayed)).toBe(true);
    expect(violations).toEqual([]);
    await context.close();
  }, 90_000);

  it("unknown codes and bad versions are refused as before and never kept", async () => {
    for (const path of ["/results/NOPE-12345", `/results/${CODE}?version=999`, "/api/public/v1/trials/NOPE-12345", "/varieties/999999", "/sites/999999"]) {
      for (let i = 0; i < 2; i += 1) {
        const res = await get(a, path);
        expect([path, res.status, cacheOf(res)]).toEqual([path, 404, "miss"]);
        await res.arrayBuffer();
      }
    }
    // addresses the cache does not keep are answered as they always were
    for (const path of [`/results/${CODE}?version=abc`, "/results/NOPE-12345?utm=1"]) {
      const res = await get(a, path);
      expect([path, res.status, cacheOf(res)]).toEqual([path, 404, null]);
      await res.arrayBuffer();
    }
  }, 60_000);
});
