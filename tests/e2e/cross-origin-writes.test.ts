import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import sharp from "sharp";
import { createDatabase } from "@/db/client";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { CROSS_SITE_MESSAGE } from "@/server/http/origin";
import type { SampleIds } from "./access-matrix";
import { baseUrl, launchBrowser, newPage, signIn } from "../helpers/browser";
import { httpSession, request, type HttpSession } from "../helpers/http";
import { loadSampleIds } from "../helpers/samples";

// State-changing requests are accepted only from Seedplot's own pages: another origin gets a 403 and
// nothing is written, and JSON must be sent as JSON (text/plain is what a page on another site can send
// without asking the browser first).

const FOREIGN = "http://evil.example";
const OWN = new URL(baseUrl).origin;

const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let ids: SampleIds;
let grower: HttpSession;
let browser: Browser;
let seedsSown: number;

beforeAll(async () => {
  ids = await loadSampleIds(e2e.pool);
  grower = await httpSession(DEMO_SITES[0].grower.email, DEMO_PASSWORDS.cooperator);
  const [rows] = (await e2e.pool.query("SELECT id FROM traits WHERE code = 'seeds_sown'")) as unknown as [{ id: number }[]];
  seedsSown = Number(rows[0]!.id);
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await e2e.pool.end();
});

/** Everything a save of site A's first plot writes: its seeds-sown value and the history and audit rows. */
async function plotState() {
  const [[value]] = (await e2e.pool.query("SELECT COUNT(*) AS n, MAX(value_number) AS v, MAX(updated_at) AS at FROM observations WHERE plot_id = ? AND trait_id = ?", [ids.plotA, seedsSown])) as unknown as [[{ n: number; v: number | null; at: Date | null }]];
  const [[history]] = (await e2e.pool.query("SELECT COUNT(*) AS n FROM observation_history oh JOIN observations o ON o.id = oh.observation_id WHERE o.plot_id = ?", [ids.plotA])) as unknown as [[{ n: number }]];
  const [[audit]] = (await e2e.pool.query("SELECT COUNT(*) AS n FROM audit_log WHERE action LIKE 'observation%'")) as unknown as [[{ n: number }]];
  return { rows: Number(value.n), value: value.v === null ? null : Number(value.v), at: value.at?.toISOString() ?? null, history: Number(history.n), audit: Number(audit.n) };
}

const saveBody = (value: string | null) => JSON.stringify({ trialId: ids.kal, siteId: ids.siteA, values: [{ plotId: ids.plotA, key: "seeds_sown", value }] });
const saveObservation = (headers: Record<string, string>, value: string | null) => request("/api/observations", grower, { method: "POST", headers, body: saveBody(value) });

/** A value seeds-sown accepts that differs from what the plot holds now. */
const freshCount = (current: number | null) => String(current === 437 ? 438 : 437);

describe("writes from other sites", () => {
  it("refuses an observation sent from another origin, as JSON or as text/plain, with 403 and saves nothing", async () => {
    const before = await plotState();
    for (const contentType of ["application/json", "text/plain"]) {
      const response = await saveObservation({ Origin: FOREIGN, "Content-Type": contentType }, freshCount(before.value));
      expect([contentType, response.status, ((await response.json()) as { error: string }).error]).toEqual([contentType, 403, CROSS_SITE_MESSAGE]);
    }
    // Without Origin, a browser's Sec-Fetch-Site or Referer decides.
    const browserSignals: Record<string, string>[] = [{ "Sec-Fetch-Site": "cross-site" }, { "Sec-Fetch-Site": "same-site" }, { Referer: `${FOREIGN}/page` }, { Origin: "null" }];
    for (const headers of browserSignals) {
      const response = await saveObservation({ ...headers, "Content-Type": "application/json" }, freshCount(before.value));
      expect([headers, response.status]).toEqual([headers, 403]);
    }
    expect(await plotState()).toEqual(before);
  });

  it("refuses JSON sent as text/plain from Seedplot's own origin with 415 and saves nothing", async () => {
    const before = await plotState();
    for (const contentType of ["text/plain", "application/x-www-form-urlencoded", ""]) {
      const response = await saveObservation({ Origin: OWN, ...(contentType ? { "Content-Type": contentType } : {}) }, freshCount(before.value));
      expect([contentType, response.status, ((await response.json()) as { error: string }).error]).toEqual([contentType, 415, expect.stringMatching(/as JSON/)]);
    }
    expect(await plotState()).toEqual(before);
  });

  it("refuses a photo sent from another origin with 403 and stores nothing", async () => {
    const photo = await sharp({ create: { width: 64, height: 48, channels: 3, background: { r: 90, g: 140, b: 60 } } }).jpeg().toBuffer();
    const caption = `Foreign photo ${Date.now().toString(36)}`;
    const form = new FormData();
    form.set("trialId", String(ids.kal));
    form.set("siteId", String(ids.siteA));
    form.set("caption", caption);
    form.set("file", new Blob([new Uint8Array(photo)], { type: "image/jpeg" }), "row.jpg");
    const response = await request("/api/photos", grower, { method: "POST", headers: { Origin: FOREIGN }, body: form });
    expect([response.status, ((await response.json()) as { error: string }).error]).toEqual([403, CROSS_SITE_MESSAGE]);
    const [[stored]] = (await e2e.pool.query("SELECT COUNT(*) AS n FROM photos WHERE caption = ?", [caption])) as unknown as [[{ n: number }]];
    expect(Number(stored.n)).toBe(0);
  });

  it("refuses a server action sent from another origin with 403 (not a server error) and runs nothing; from Seedplot's origin it runs", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto("/portal/catalogue");
    const crop = `Cross-origin check ${Date.now().toString(36)}`;
    // The browser's own "Add crop" request, held back and then sent from here with the browser's cookies,
    // once as a page on another site would send it and once as Seedplot's page does.
    let captured: { headers: Record<string, string>; body: Buffer } | null = null;
    await page.route("**/portal/catalogue", (route) => {
      const req = route.request();
      if (req.method() !== "POST" || !req.headers()["next-action"]) return route.continue();
      captured = { headers: req.headers(), body: req.postDataBuffer()! };
      return route.abort();
    });
    await page.locator("#crop-name").fill(crop);
    await page.locator("#cropGroup").selectOption({ index: 1 });
    await page.getByRole("button", { name: /Add crop/i }).click();
    await expect.poll(() => captured !== null).toBe(true);
    const { headers, body } = captured!;
    const cookie = (await context.cookies()).map((c) => `${c.name}=${c.value}`).join("; ");
    const send = (origin: string) =>
      request("/portal/catalogue", null, {
        method: "POST",
        headers: { "content-type": headers["content-type"]!, "next-action": headers["next-action"]!, "next-router-state-tree": headers["next-router-state-tree"] ?? "", accept: "text/x-component", cookie, origin },
        body: new Uint8Array(body),
      });
    const cropCount = async () => {
      const [[row]] = (await e2e.pool.query("SELECT COUNT(*) AS n FROM crops WHERE name = ?", [crop])) as unknown as [[{ n: number }]];
      return Number(row.n);
    };

    const foreign = await send(FOREIGN);
    expect([foreign.status, await foreign.text()]).toEqual([403, CROSS_SITE_MESSAGE]);
    expect(await cropCount()).toBe(0);

    const own = await send(OWN);
    expect(own.status).toBe(200);
    await own.body?.cancel();
    expect(await cropCount()).toBe(1);
    await context.close();
  }, 60_000);

  it("still saves an observation sent from Seedplot's own origin", async () => {
    const before = await plotState();
    const value = freshCount(before.value);
    const ownSignals: Record<string, string>[] = [{ Origin: OWN }, { "Sec-Fetch-Site": "same-origin" }, { Referer: `${OWN}/portal/record` }];
    for (const headers of ownSignals) {
      const response = await saveObservation({ ...headers, "Content-Type": "application/json; charset=utf-8" }, value);
      expect([headers, response.status]).toEqual([headers, 200]);
    }
    expect((await plotState()).value).toBe(Number(value));
    // Put the plot back as it was for the other browser tests.
    const restore = await saveObservation({ Origin: OWN, "Content-Type": "application/json" }, before.value === null ? null : String(before.value));
    expect(restore.status).toBe(200);
  });
});
