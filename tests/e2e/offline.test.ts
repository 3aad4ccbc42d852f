import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import { createDatabase } from "@/db/client";
import * as s from "@/db/schema";
import { PERSONAL_CACHES, PHONE_DB, PHONE_STORE } from "@/lib/domain/offline";
import { baseUrl, FLAGS, launchBrowser, newPage, signIn } from "../helpers/browser";

// A grower's phone as a real chromium profile on disk: closing the context and opening a new one on the
// same folder is the phone's browser being killed and started again (service worker, its caches,
// IndexedDB and the session cookie all stay, as on a phone).

const GROWER = "luis@brightwater.example";
const GROWER_PASSWORD = "seedplot-grower-demo";
const PHONE = { width: 390, height: 844 };
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let profile: string;
let site: { trialId: number; siteId: number; plots: { id: number; plotCode: string }[]; qualityTraitId: number };
let luisId: number;

const openPhone = (): Promise<BrowserContext> =>
  chromium.launchPersistentContext(profile, { executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium", args: FLAGS, headless: true, baseURL: baseUrl, viewport: PHONE, isMobile: true, hasTouch: true });

const siteAddress = () => `/portal/record/${site.trialId}/${site.siteId}`;

async function storedQuality(plotIds: number[]) {
  return e2e.db
    .select({ id: s.observations.id, plotId: s.observations.plotId, valueNumber: s.observations.valueNumber })
    .from(s.observations)
    .where(and(inArray(s.observations.plotId, plotIds), eq(s.observations.traitId, site.qualityTraitId)));
}

/** The quality field of the nth plot on the page, with the form showing quality only. */
async function chooseQuality(page: Page) {
  const column = page.getByLabel("What are you recording?");
  await column.waitFor();
  await column.selectOption("quality");
}

const qualityInput = (page: Page, plotId: number) => page.locator(`#v-${plotId}-quality`);
const stateOf = (page: Page, plotId: number) => page.locator(`#v-${plotId}-quality-state`);

/** Waits until the service worker controls the page and keeps this site's recording page. */
async function waitUntilKeptForOffline(page: Page) {
  const kept = () => page.evaluate(async () => Boolean(navigator.serviceWorker.controller) && Boolean(await caches.match(location.pathname)));
  await expect.poll(kept, { timeout: 60_000 }).toBe(true);
}

beforeAll(async () => {
  profile = await mkdtemp(path.join(os.tmpdir(), "seedplot-phone-"));
  const [u] = await e2e.db.select({ id: s.users.id }).from(s.users).where(eq(s.users.email, GROWER));
  luisId = u!.id;
  const [e] = await e2e.db
    .select({ enrolmentId: s.enrolments.id, trialId: s.trials.id, siteId: s.sites.id })
    .from(s.enrolments)
    .innerJoin(s.trials, eq(s.trials.id, s.enrolments.trialId))
    .innerJoin(s.sites, eq(s.sites.id, s.enrolments.siteId))
    .where(and(eq(s.trials.code, "TV27-KAL"), eq(s.sites.name, "Brightwater Flower Farm")));
  const plots = await e2e.db.select({ id: s.plots.id, plotCode: s.plots.plotCode }).from(s.plots).where(eq(s.plots.enrolmentId, e!.enrolmentId)).orderBy(s.plots.block, s.plots.position);
  const [quality] = await e2e.db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "quality"));
  site = { trialId: e!.trialId, siteId: e!.siteId, plots, qualityTraitId: quality!.id };
  await e2e.db.delete(s.observations).where(and(inArray(s.observations.plotId, plots.map((p) => p.id)), eq(s.observations.traitId, quality!.id)));
});

afterAll(async () => {
  await e2e.db.delete(s.observations).where(and(inArray(s.observations.plotId, site.plots.map((p) => p.id)), eq(s.observations.traitId, site.qualityTraitId)));
  await e2e.pool.end();
  await rm(profile, { recursive: true, force: true });
});

describe("a grower records on a phone without a signal", () => {
  it("the recording page works offline across a reload and a restart, every value is saved once, and a coordinator's change comes back as a choice", async () => {
    const typed = site.plots.slice(0, 3);
    const contested = site.plots[3]!;

    let phone = await openPhone();
    let page = phone.pages()[0] ?? (await phone.newPage());
    await signIn(page, GROWER, GROWER_PASSWORD);
    await page.goto(siteAddress());
    await waitUntilKeptForOffline(page);

    // While the phone is away, the coordinator records the contested plot through the real save route.
    const browser = await launchBrowser();
    const staff = await newPage(browser);
    await signIn(staff.page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
    const status = await staff.page.evaluate(
      async (body) => (await fetch("/api/observations", { method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(body) })).status,
      { trialId: site.trialId, siteId: site.siteId, values: [{ plotId: contested.id, key: "quality", value: "8" }] },
    );
    expect(status).toBe(200);
    await browser.close();

    // No signal: a reload still opens the recording page, from the phone.
    await phone.setOffline(true);
    await page.reload();
    await page.getByRole("heading", { name: /Brightwater Flower Farm: Baby-leaf kale/ }).waitFor();
    await page.getByText("No signal. Values you type are kept on this phone and sent when the signal is back.").waitFor();
    // A plot label scanned without a signal opens the site's kept page.
    await page.goto(`${siteAddress()}?plot=${typed[0]!.id}`);
    await page.getByRole("heading", { name: /Brightwater Flower Farm: Baby-leaf kale/ }).waitFor();
    await page.goto(siteAddress());
    await chooseQuality(page);
    // The kept page is as it was: the coordinator's 8 is not on it yet.
    expect(await qualityInput(page, contested.id).inputValue()).toBe("");
    const values = ["5", "6", "7"];
    for (const [i, plot] of typed.entries()) {
      await qualityInput(page, plot.id).fill(values[i]!);
      await qualityInput(page, plot.id).press("Enter");
    }
    await qualityInput(page, contested.id).fill("4");
    await qualityInput(page, contested.id).press("Enter");
    await page.getByText("No signal. 4 values are waiting on this phone and go by themselves when the signal is back.").waitFor();
    await expect.poll(() => stateOf(page, typed[0]!.id).textContent()).toBe("Waiting on this phone · Nothing saved on Seedplot yet");
    await page.screenshot({ path: path.join(os.tmpdir(), "seedplot-offline-waiting.png"), fullPage: false });

    // The tab survives a reload without a signal: the values come back from the phone.
    await page.reload();
    await chooseQuality(page);
    await expect.poll(() => qualityInput(page, typed[2]!.id).inputValue()).toBe("7");
    await page.getByText("No signal. 4 values are waiting on this phone", { exact: false }).waitFor();

    // The browser is killed while still offline.
    await phone.close();

    // Started again with a signal: every waiting value is sent, once, and the contested one asks.
    phone = await openPhone();
    page = phone.pages()[0] ?? (await phone.newPage());
    await page.goto(siteAddress());
    await chooseQuality(page);
    const choice = page.getByRole("group", { name: new RegExp(`^${contested.plotCode}, .*: Someone else changed this value$`) });
    await choice.getByText("Seedplot now has 8. You typed 4. Which is right?").waitFor({ timeout: 30_000 });
    for (const plot of typed) await expect.poll(() => stateOf(page, plot.id).textContent(), { timeout: 30_000 }).toBe("Saved");
    await page.screenshot({ path: path.join(os.tmpdir(), "seedplot-offline-conflict.png"), fullPage: false });

    const saved = await storedQuality([...typed, contested].map((p) => p.id));
    expect(Object.fromEntries(saved.map((o) => [o.plotId, o.valueNumber]))).toEqual({ [typed[0]!.id]: 5, [typed[1]!.id]: 6, [typed[2]!.id]: 7, [contested.id]: 8 });
    // Once each: one audit entry per value, no earlier versions.
    const audits = await e2e.db.select({ entityId: s.auditLog.entityId }).from(s.auditLog).where(and(eq(s.auditLog.actorId, luisId), inArray(s.auditLog.entityId, saved.map((o) => String(o.id)))));
    expect(audits.map((a) => Number(a.entityId)).sort()).toEqual(saved.filter((o) => o.plotId !== contested.id).map((o) => o.id).sort());
    expect(await e2e.db.select().from(s.observationHistory).where(inArray(s.observationHistory.observationId, saved.map((o) => o.id)))).toEqual([]);

    // The grower keeps the coordinator's value: nothing is overwritten and nothing waits any more.
    await choice.getByRole("button", { name: "Keep 8" }).click();
    await expect.poll(() => qualityInput(page, contested.id).inputValue()).toBe("8");
    await page.getByText("Values save as you go.").waitFor();
    expect((await storedQuality([contested.id]))[0]!.valueNumber).toBe(8);

    // Signing out deletes what the phone keeps, after saying what has not been sent.
    await phone.setOffline(true);
    await qualityInput(page, site.plots[4]!.id).fill("3");
    await qualityInput(page, site.plots[4]!.id).press("Enter");
    await page.getByText("No signal. 1 value is waiting on this phone", { exact: false }).waitFor();
    // Back online, but the save route stays out of reach, so the value is still waiting at sign-out.
    await phone.route("**/api/observations", (route) => route.abort());
    await phone.setOffline(false);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByText("1 value typed on this phone has not reached Seedplot yet. Signing out deletes it from this phone.").waitFor();
    await page.screenshot({ path: path.join(os.tmpdir(), "seedplot-offline-sign-out.png"), fullPage: false });
    await page.getByRole("button", { name: "Sign out and delete it" }).click();
    await page.waitForURL((url) => url.pathname === "/");
    const left = await page.evaluate(
      async ({ dbName, storeName, cacheNames }) => {
        const db = await new Promise<IDBDatabase>((resolve, reject) => {
          const open = indexedDB.open(dbName);
          open.onsuccess = () => resolve(open.result);
          open.onerror = () => reject(open.error);
          open.onupgradeneeded = () => open.result.createObjectStore(storeName);
        });
        const count = await new Promise<number>((resolve) => {
          const req = db.transaction(storeName).objectStore(storeName).count();
          req.onsuccess = () => resolve(req.result);
        });
        db.close();
        const kept = await Promise.all(cacheNames.map((name) => caches.has(name)));
        return { count, kept: cacheNames.filter((_, i) => kept[i]) };
      },
      { dbName: PHONE_DB, storeName: PHONE_STORE, cacheNames: [...PERSONAL_CACHES] },
    );
    expect(left).toEqual({ count: 0, kept: [] });
    await phone.close();
  }, 240_000);
});
