import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, eq, inArray, ne } from "drizzle-orm";
import { seriousAccessibilityProblems } from "../helpers/axe";
import { baseUrl, launchBrowser, newPage, signIn } from "../helpers/browser";
import { createDatabase } from "@/db/client";
import * as s from "@/db/schema";
import { DEMO_PASSWORDS, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";

// The browser tests' server reads the seedplot_e2e database; this file checks it directly too.
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
const PUBLISHED = DEMO_TRIALS.find((t) => t.code === "TV26-LET")!;
const NEVER_PUBLISHED = DEMO_TRIALS.find((t) => t.code === "TV27-KAL")!;
let browser: Browser;

// One lettuce site shares its results with its grower before publication; the public must not learn it.
const SHARED_SITE = "Willow Bend Farm";
const shareLettuceSite = (shared: boolean) =>
  e2e.pool.query("UPDATE enrolments e JOIN trials t ON t.id = e.trial_id JOIN sites s ON s.id = e.site_id SET e.results_shared = ? WHERE t.code = ? AND s.name = ?", [shared ? 1 : 0, PUBLISHED.code, SHARED_SITE]);

beforeAll(async () => {
  browser = await launchBrowser();
  await shareLettuceSite(true);
});
afterAll(async () => {
  await shareLettuceSite(false);
  await browser?.close();
  await e2e.pool.end();
});

async function status(pathname: string) {
  return (await fetch(new URL(pathname, baseUrl), { redirect: "manual" })).status;
}

/**
 * Every public address that could show something of a trial, its varieties or its sites. A variety also
 * entered in another trial that is published (the demo's lettuces grown in 2025 and 2026) has a public page of
 * its own: `sharedVarieties` lists those.
 */
async function publicAddressesOf(code: string) {
  const [trial] = await e2e.db.select({ id: s.trials.id, title: s.trials.title }).from(s.trials).where(eq(s.trials.code, code));
  const entries = await e2e.db.select({ varietyId: s.trialEntries.varietyId }).from(s.trialEntries).where(eq(s.trialEntries.trialId, trial!.id));
  const elsewhere = await e2e.db
    .select({ varietyId: s.trialEntries.varietyId })
    .from(s.trialEntries)
    .innerJoin(s.trials, eq(s.trials.id, s.trialEntries.trialId))
    .where(and(ne(s.trials.id, trial!.id), eq(s.trials.status, "published")));
  const published = new Set(elsewhere.map((e) => e.varietyId));
  return {
    trialId: trial!.id,
    title: trial!.title,
    pages: [`/results/${code}`, `/results/${code}?version=1`, `/results/${code}/report`, `/results/${code}/data?format=csv`, `/results/${code}/data?format=xlsx`, `/api/public/v1/trials/${code}`, `/api/public/v1/trials/${code}/results`, `/api/public/v1/trials/${code}/plots`],
    varieties: entries.filter((e) => !published.has(e.varietyId)).map((e) => `/varieties/${e.varietyId}`),
    sharedVarieties: entries.filter((e) => published.has(e.varietyId)).map((e) => `/varieties/${e.varietyId}`),
  };
}

/** Sites that took part only in unpublished trials must not have a public page. */
async function sitesOnlyIn(codes: string[]) {
  const rows = await e2e.db
    .select({ siteId: s.enrolments.siteId, code: s.trials.code })
    .from(s.enrolments)
    .innerJoin(s.trials, eq(s.trials.id, s.enrolments.trialId));
  const bySite = new Map<number, Set<string>>();
  for (const r of rows) bySite.set(r.siteId, (bySite.get(r.siteId) ?? new Set()).add(r.code));
  return [...bySite.entries()].filter(([, c]) => [...c].every((x) => codes.includes(x))).map(([id]) => `/sites/${id}`);
}

async function expectNothingPublic(code: string) {
  const { pages, varieties, sharedVarieties, title } = await publicAddressesOf(code);
  for (const p of [...pages, ...varieties]) expect([p, await status(p)]).toEqual([p, 404]);
  // A variety's public page lists its published trials only: nothing of this one.
  for (const p of sharedVarieties) {
    const html = await (await fetch(new URL(p, baseUrl))).text();
    // the title as a whole text or string ("…, first year" is the published trial's own title)
    expect([p, html.includes(code), html.includes(`>${title}<`) || html.includes(`"${title}"`)]).toEqual([p, false, false]);
  }
  const index = await (await fetch(new URL(`/api/public/v1/trials?q=${encodeURIComponent(code)}`, baseUrl))).json();
  expect(index.trials).toEqual([]);
  const html = await (await fetch(new URL(`/results?q=${encodeURIComponent(code)}`, baseUrl))).text();
  expect(html).toContain("No published results match.");
}

describe("publishing and the public pages", () => {
  it("shows nothing of unpublished trials at any public address, including guessed ids", async () => {
    // the demo publishes its spring spinach trial and the 2025 lettuce trial; the others start unpublished
    const unpublished = DEMO_TRIALS.filter((t) => !t.publishedAtSeed);
    // TV26-LET shares four varieties with the published TV25-LET, so the shared-variety check below has work to do.
    expect((await publicAddressesOf(PUBLISHED.code)).sharedVarieties.length).toBeGreaterThan(0);
    for (const t of unpublished) await expectNothingPublic(t.code);
    for (const p of await sitesOnlyIn(unpublished.map((t) => t.code))) expect([p, await status(p)]).toEqual([p, 404]);
    for (const p of ["/results/NOPE-123", "/results/..%2f..%2fetc", "/varieties/999999", "/varieties/abc", "/sites/0", "/api/public/v1/trials/%27%20OR%201%3D1", "/api/public/trials/%27%20OR%201%3D1"]) {
      expect([p, await status(p)]).toEqual([p, 404]);
    }
  }, 60_000);

  it("lets a coordinator publish only after confirming the sites left out; the public page and its PDF show the summary and every variety", async () => {
    const staff = await newPage(browser);
    await signIn(staff.page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    const { trialId } = await publicAddressesOf(PUBLISHED.code);
    const [rows] = await e2e.pool.query(
      "SELECT s.name, COALESCE(sub.status, 'draft') AS status FROM enrolments e JOIN sites s ON s.id = e.site_id LEFT JOIN submissions sub ON sub.enrolment_id = e.id WHERE e.trial_id = ? ORDER BY s.name",
      [trialId],
    );
    const enrolled = rows as { name: string; status: string }[];
    const leftOut = enrolled.filter((r) => r.status !== "accepted").map((r) => r.name);
    // The demo keeps one lettuce site's data sent for review; other files may have returned it, never accepted it.
    expect(leftOut.length).toBeGreaterThan(0);
    await staff.page.goto(`/portal/trials/${trialId}/publish`);
    await staff.page.getByRole("heading", { name: /Publish results/ }).waitFor();
    // Each enrolled site is listed as in the next version or not, and why.
    const list = staff.page.getByRole("list", { name: "Sites in the next version" });
    expect(await list.getByRole("listitem").count()).toBe(enrolled.length);
    for (const name of leftOut) expect(await list.getByRole("listitem").filter({ hasText: name }).innerText()).toMatch(/Not included: /);
    await staff.page.getByText(`The next version will include ${enrolled.length - leftOut.length} of ${enrolled.length} sites`).waitFor();

    // Without the confirmation the server refuses and names the sites; nothing is published.
    await staff.page.getByRole("button", { name: "Publish version 1" }).click();
    await staff.page.getByRole("status").getByText(`This version would leave out ${leftOut.join(", ")}.`).waitFor({ timeout: 60_000 });
    const [versions] = await e2e.pool.query("SELECT COUNT(*) AS n FROM published_reports WHERE trial_id = ?", [trialId]);
    expect((versions as { n: number }[])[0]!.n).toBe(0);

    await staff.page.getByRole("checkbox", { name: `Publish without ${leftOut.join(", ")}.` }).check();
    await staff.page.getByRole("button", { name: "Publish version 1" }).click();
    await staff.page.getByText("Published as version 1.").waitFor({ timeout: 60_000 });
    await staff.context.close();

    const visitor = await newPage(browser, { width: 390, height: 844 });
    await visitor.page.goto(`/results/${PUBLISHED.code}`);
    await visitor.page.getByRole("heading", { name: "Summary for growers" }).waitFor();
    const summary = await visitor.page.getByRole("region", { name: "Summary for growers" }).innerText();
    for (const entry of PUBLISHED.entries) expect(await visitor.page.getByRole("link", { name: entry.variety }).count()).toBeGreaterThan(0);
    expect(await visitor.page.title()).toContain(PUBLISHED.title);
    await visitor.page.getByText(`Results from ${enrolled.length - leftOut.length} of ${enrolled.length} sites.`).waitFor();
    for (const name of leftOut) await visitor.page.getByRole("list", { name: "Sites not included" }).getByText(`${name} is not included:`).waitFor();

    const download = await fetch(new URL(`/results/${PUBLISHED.code}/report`, baseUrl));
    expect(download.status).toBe(200);
    expect(download.headers.get("content-type")).toBe("application/pdf");
    const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-e2e-pdf-"));
    const file = path.join(dir, "report.pdf");
    await fs.writeFile(file, Buffer.from(await download.arrayBuffer()));
    const text = execFileSync("pdftotext", ["-layout", file, "-"]).toString().replace(/\s+/g, " ");
    for (const entry of PUBLISHED.entries) expect(text).toContain(entry.variety);
    const firstLine = summary.split("\n").find((l) => l.includes(":"))!;
    expect(text).toContain(firstLine.trim().slice(0, 40).replace(/\s+/g, " "));
    execFileSync("pdftoppm", ["-png", "-r", "50", "-f", "1", "-l", "3", file, path.join(dir, "page")]);
    expect((await fs.readdir(dir)).filter((n) => n.endsWith(".png")).length).toBe(3);

    const csv = await (await fetch(new URL(`/results/${PUBLISHED.code}/data?format=csv`, baseUrl))).text();
    expect(csv).toContain(PUBLISHED.title);
    expect(csv.split("\n")[1]).toContain("site,block,plot,code,variety,trait,unit,value,status");
    await visitor.context.close();

    // Publishing revealed nothing of the other trials.
    await expectNothingPublic(NEVER_PUBLISHED.code);
  }, 180_000);

  it("the public page, JSON and variety and site pages of a published trial show no review state, sharing flag or internal id", async () => {
    const { trialId } = await publicAddressesOf(PUBLISHED.code);
    const [statuses] = await e2e.pool.query("SELECT DISTINCT sub.status FROM submissions sub JOIN enrolments e ON e.id = sub.enrolment_id WHERE e.trial_id = ?", [trialId]);
    // At least one site's data were not accepted when the trial was published (which state depends on the files run before).
    expect((statuses as { status: string }[]).some((r) => r.status !== "accepted")).toBe(true);
    const [[variety], [site]] = await Promise.all([
      e2e.db.select({ id: s.trialEntries.varietyId }).from(s.trialEntries).where(eq(s.trialEntries.trialId, trialId)).limit(1),
      e2e.db.select({ id: s.enrolments.siteId }).from(s.enrolments).where(eq(s.enrolments.trialId, trialId)).limit(1),
    ]);
    const api = `/api/public/v1/trials/${PUBLISHED.code}`;
    for (const pathname of [`/results/${PUBLISHED.code}`, api, `${api}/results`, `${api}/plots`, `/varieties/${variety!.id}`, `/sites/${site!.id}`, "/results", "/api/public/v1/trials"]) {
      const response = await fetch(new URL(pathname, baseUrl));
      expect([pathname, response.status]).toEqual([pathname, 200]);
      // Pages carry their data as escaped JSON, so keys are matched with or without the backslashes.
      const raw = await response.text();
      const body = raw.replace(/\\"/g, '"');
      expect([pathname, body.match(/"(siteId|entryId|plotId|traitId|resultsShared|shared|included|why|includeUnaccepted|scopeTraitId)":/)?.[0] ?? null]).toEqual([pathname, null]);
      // The open data API names things by code and name: no id at all.
      if (pathname.startsWith("/api/")) expect([pathname, body.match(/"[A-Za-z]*[iI]d":/)?.[0] ?? null]).toEqual([pathname, null]);
      for (const status of (statuses as { status: string }[]).map((r) => r.status)) expect([pathname, body.includes(`"${status}"`)]).toEqual([pathname, false]);
      expect([pathname, /not accepted yet/i.test(body)]).toEqual([pathname, false]);
    }
  }, 60_000);

  it("has no serious or critical accessibility problems on the public index, trial and variety pages", async () => {
    const [variety] = await e2e.db
      .select({ id: s.varieties.id })
      .from(s.varieties)
      .where(inArray(s.varieties.name, PUBLISHED.entries.map((e) => e.variety)))
      .limit(1);
    const context = await browser.newContext({ baseURL: baseUrl, bypassCSP: true });
    const page = await context.newPage();
    for (const pathname of ["/", "/results", `/results/${PUBLISHED.code}`, `/varieties/${variety!.id}`]) {
      await page.goto(pathname);
      await page.waitForLoadState("networkidle");
      expect([pathname, await seriousAccessibilityProblems(page)]).toEqual([pathname, []]);
    }
    await context.close();
  }, 120_000);
});
