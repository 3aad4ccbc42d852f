import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { unique } from "../helpers/db";

let browser: Browser;
// The layout built by the coordinator below; no demo grower is attached to it.
let foreignLayout: string | null = null;

beforeAll(async () => {
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
});

describe("coordinator sets up a trial in the browser", () => {
  it("creates a trial with four entries, enrols two sites, randomises and downloads a map with every blind code", async () => {
    const { page, context } = await newPage(browser);
    try {
      await signIn(page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
      await page.goto("/portal/trials/new");
      await page.getByLabel("Season").selectOption({ index: 1 });
      await page.getByLabel("Crop", { exact: true }).selectOption({ label: "Lettuce" });
      const code = unique("E2E").toUpperCase().replace(/[^A-Z0-9-]/g, "").slice(0, 30);
      await page.getByLabel("Trial code").fill(code);
      await page.getByLabel("Title").fill("Browser-made lettuce trial");
      await page.getByLabel("Blocks (replicates) per site").fill("3");
      await page.getByLabel(/Seedlings emerged \(count\)/).check();
      await page.getByRole("button", { name: "Create draft trial" }).click();
      await page.waitForURL(/\/portal\/trials\/\d+$/, { timeout: 30_000 });

      for (let i = 0; i < 4; i += 1) {
        await page.getByLabel("Variety", { exact: true }).selectOption({ index: 1 });
        await page.getByRole("button", { name: "Add entry" }).click();
        await expect.poll(() => page.getByRole("cell", { name: /^[A-Z0-9]{3}$/ }).count(), { timeout: 20_000 }).toBe(i + 1);
      }

      for (let i = 0; i < 2; i += 1) {
        await page.getByLabel("Site", { exact: true }).selectOption({ index: 1 });
        await page.getByRole("button", { name: "Enrol site" }).click();
        await expect.poll(() => page.getByText("Not laid out yet").count(), { timeout: 20_000 }).toBe(i + 1);
      }

      // Entries, sites and layouts on this page are fetched from the JSON API and refetched after each
      // action; a flag on the window proves the page itself was never reloaded.
      const trialId = Number(new URL(page.url()).pathname.split("/").pop());
      const entryCodes = (await page.getByRole("cell", { name: /^[A-Z0-9]{3}$/ }).allTextContents()).map((t) => t.trim());
      expect(entryCodes).toHaveLength(4);
      await page.evaluate(() => Object.assign(window, { seedplotSamePage: true }));
      const isLayoutCall = (url: URL | string) => /^\/api\/trials\/\d+\/sites\/\d+\/layout$/.test(new URL(url).pathname);
      for (let i = 0; i < 2; i += 1) {
        // The second site's layout first fails to load, to show the error state and its retry.
        if (i === 1) {
          await page.route(isLayoutCall, (route) => route.fulfill({ status: 503, contentType: "application/json", body: JSON.stringify({ error: "The database is not answering right now." }) }));
        }
        const trialRefetch = page.waitForResponse((r) => new URL(r.url()).pathname === `/api/trials/${trialId}` && r.request().method() === "GET" && r.ok(), { timeout: 20_000 });
        await page.getByRole("button", { name: /^Randomise/ }).first().click();
        await trialRefetch;
        await expect.poll(() => page.getByRole("link", { name: "Layout and printables" }).count(), { timeout: 20_000 }).toBe(i + 1);
        const layout = page.getByRole("region", { name: /^Layout of / }).nth(i);
        if (i === 1) {
          await layout.getByRole("alert").filter({ hasText: "The database is not answering right now." }).waitFor({ timeout: 20_000 });
          await page.unroute(isLayoutCall);
          const layoutFetch = page.waitForResponse((r) => isLayoutCall(r.url()) && r.ok(), { timeout: 20_000 });
          await layout.getByRole("button", { name: "Try again" }).click();
          await layoutFetch;
        }
        // Three blocks of four inserts fill one flat, each entry once per block.
        await layout.getByRole("heading", { name: "Flat 1" }).waitFor({ timeout: 20_000 });
        for (const code of entryCodes) expect(await layout.getByText(code, { exact: true }).count()).toBe(3);
      }

      // The sowing date is set after enrolment; the site list shows it without a reload.
      await page.getByRole("button", { name: /^Set sowing date at/ }).first().click();
      await page.getByRole("button", { name: "Save sowing date" }).click();
      await page.getByText("Enter the sowing date like 2027-03-18.").first().waitFor();
      await page.getByLabel(/^Sowing date at/).fill("2027-03-18");
      await page.getByRole("button", { name: "Save sowing date" }).click();
      await page.getByText(/^Sowing date set to Mar 18, 2027/).waitFor({ timeout: 20_000 });
      await page.getByText(/^Sowing: Mar 18, 2027/).waitFor({ timeout: 20_000 });
      expect(await page.evaluate(() => (window as unknown as { seedplotSamePage?: boolean }).seedplotSamePage)).toBe(true);

      await page.getByRole("link", { name: "Layout and printables" }).first().click();
      await page.waitForURL(/\/sites\/\d+$/);
      foreignLayout = new URL(page.url()).pathname.replace("/portal/trials/", "");
      const codes = [...new Set((await page.locator("tbody td.font-mono").allTextContents()).map((t) => t.trim()))];
      expect(codes).toHaveLength(4);
      const href = await page.getByRole("link", { name: /map \(PDF\)/ }).getAttribute("href");
      const response = await page.request.get(href!);
      expect(response.status()).toBe(200);
      expect(response.headers()["content-type"]).toBe("application/pdf");

      const dir = mkdtempSync(path.join(tmpdir(), "seedplot-e2e-"));
      const file = path.join(dir, "map.pdf");
      writeFileSync(file, await response.body());
      execFileSync("pdftoppm", ["-png", "-r", "50", "-f", "1", "-l", "1", file, path.join(dir, "map")]);
      expect(existsSync(path.join(dir, "map-1.png"))).toBe(true);
      const text = execFileSync("pdftotext", [file, "-"]).toString();
      for (const c of codes) expect(text).toContain(c);
    } finally {
      await context.close();
    }
  }, 120_000);

  it("edits and deletes a catalogue crop from its table, and is told plainly why a crop in use stays", async () => {
    const { page, context } = await newPage(browser);
    page.on("dialog", (d) => void d.accept());
    try {
      await signIn(page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
      await page.goto("/portal/catalogue");
      const name = unique("Amaranth");
      await page.locator("#crop-name").fill(name);
      await page.getByLabel("Crop group").first().selectOption({ label: "Leafy greens" });
      await page.getByRole("button", { name: "Add crop" }).click();
      await page.getByText(`${name} added to the catalogue.`).waitFor();

      await page.getByRole("button", { name: `Edit ${name}` }).click();
      const dialog = page.getByRole("dialog", { name: `Edit ${name}` });
      await dialog.getByLabel("Crop name").fill(`${name} Red`);
      await dialog.getByRole("button", { name: "Save crop" }).click();
      await page.getByRole("status").filter({ hasText: `${name} Red saved.` }).waitFor({ timeout: 20_000 });
      await expect.poll(() => dialog.count()).toBe(0);
      await page.getByRole("cell", { name: `${name} Red`, exact: true }).waitFor();

      await page.getByRole("button", { name: `Delete ${name} Red` }).click();
      await page.getByRole("status").filter({ hasText: "Crop deleted." }).waitFor({ timeout: 20_000 });
      await expect.poll(() => page.getByRole("cell", { name: `${name} Red`, exact: true }).count()).toBe(0);

      // Spinach is grown by this program only (lettuce also by the second demo program, which leaves it to admins).
      await page.getByRole("button", { name: "Delete Spinach" }).click();
      await page.getByRole("status").filter({ hasText: /Spinach cannot be deleted because it is the crop of trials? / }).waitFor({ timeout: 20_000 });
      await page.reload();
      await page.getByRole("button", { name: "Delete Spinach" }).waitFor();
    } finally {
      await context.close();
    }
  }, 90_000);

  it("gives a grower their own site's printables with blind codes only, and nothing of other sites", async () => {
    const { page, context } = await newPage(browser);
    try {
      await signIn(page, "tomas@willowbend.example", "seedplot-grower-demo");
      const mine = (await (await page.request.get("/api/trials")).json()) as { trials: { trialId: number; siteId: number }[] };
      expect(mine.trials.length).toBeGreaterThan(0);
      const own = mine.trials[0]!;
      const layout = (await (await page.request.get(`/api/trials/${own.trialId}/sites/${own.siteId}/layout`)).json()) as { showKey: boolean; plots: Record<string, unknown>[] };
      expect(layout.showKey).toBe(false);
      expect(layout.plots.length).toBeGreaterThan(0);
      expect(layout.plots.every((p) => !("variety" in p) && typeof p.blindCode === "string")).toBe(true);
      const labels = await page.request.get(`/portal/trials/${own.trialId}/sites/${own.siteId}/sheets?kind=labels`);
      expect(labels.status()).toBe(200);
      expect(labels.headers()["content-type"]).toBe("application/pdf");

      expect((await page.request.get(`/api/trials/${own.trialId}`)).status()).toBe(403);
      if (foreignLayout) {
        expect((await page.request.get(`/portal/trials/${foreignLayout}/sheets?kind=map`)).status()).toBe(404);
        expect((await page.request.get(`/api/trials/${foreignLayout}/layout`)).status()).toBe(404);
      }
      expect((await page.request.get("/portal/trials/999999/sites/999999/sheets?kind=map")).status()).toBe(404);
      expect((await page.request.get(`/portal/trials/${own.trialId}/sites/${own.siteId}/sheets?kind=poster`)).status()).toBe(400);
    } finally {
      await context.close();
    }
  }, 90_000);
});
