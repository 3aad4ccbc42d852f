import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import ExcelJS from "exceljs";
import { createDatabase } from "@/db/client";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_TRIALS } from "@/db/demo-data";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { httpSession, request } from "../helpers/http";

// A grower whose spinach site's results are shared opens the analysis in a real browser and over plain
// HTTP before the trial is published, so the key must stay with staff: nothing in the page, its data or
// the site's downloads may tell which blind code is which variety. The demo ships the spinach trial
// published, so this file puts the trial back in analysis for its run (the stored versions stay) and
// restores it afterwards.

const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
const SPINACH = DEMO_TRIALS.find((t) => t.code === "TV26-SPN")!;
const GROWER = DEMO_SITES.find((x) => x.name === "Maple Run Community Garden")!;
const NAMES = [...SPINACH.entries.map((e) => e.variety), ...new Set(SPINACH.entries.map((e) => e.source))];
let trialId: number;
let siteId: number;
let browser: Browser;

async function setShared(shared: boolean) {
  await e2e.pool.query("UPDATE enrolments e JOIN sites s ON s.id = e.site_id SET e.results_shared = ? WHERE e.trial_id = ? AND s.name = ?", [shared ? 1 : 0, trialId, GROWER.name]);
}

/** Anything in a page or a body that decodes a blind code: a name or source, the check flag, label germination, seed lots. */
function expectBlind(where: string, text: string) {
  for (const name of NAMES) expect(text, `${where}: ${name}`).not.toContain(name);
  for (const marker of [/isCheck/, /labelPercent|labelGermination/, /seedLot/, /varietyName|varietyId/, /Compared with the seed label/, />check</]) expect(text, where).not.toMatch(marker);
}

beforeAll(async () => {
  const [rows] = await e2e.pool.query("SELECT t.id AS trialId, s.id AS siteId FROM trials t JOIN enrolments e ON e.trial_id = t.id JOIN sites s ON s.id = e.site_id WHERE t.code = ? AND s.name = ?", [SPINACH.code, GROWER.name]);
  ({ trialId, siteId } = (rows as { trialId: number; siteId: number }[])[0]!);
  await e2e.pool.query("UPDATE trials SET status = 'analysing' WHERE id = ?", [trialId]);
  await setShared(true);
  browser = await launchBrowser();
});

afterAll(async () => {
  await setShared(false);
  await e2e.pool.query("UPDATE trials SET status = 'published' WHERE id = ?", [trialId]);
  await browser?.close();
  await e2e.pool.end();
});

describe("a grower's shared results before publication", () => {
  it("the grower's analysis page, its JSON and the site's downloads name no variety and mark no check or label germination", async () => {
    const session = await httpSession(GROWER.grower.email, DEMO_PASSWORDS.cooperator);
    const page = await request(`/portal/trials/${trialId}/analysis`, session);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain("Analysis: ");
    expectBlind("analysis page", html);
    for (const query of ["", "?plots=1"]) {
      const api = await request(`/api/trials/${trialId}/analysis${query}`, session);
      expect(api.status).toBe(200);
      expectBlind(`analysis JSON${query}`, await api.text());
    }
    const csv = await request(`/api/record/${trialId}/${siteId}/export`, session);
    expect(csv.status).toBe(200);
    expectBlind("site CSV", await csv.text());
    const template = await request(`/api/record/${trialId}/${siteId}/template`, session);
    expect(template.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(await template.arrayBuffer());
    const cells: string[] = [];
    for (const sheet of book.worksheets) sheet.eachRow((row) => row.eachCell((c) => void cells.push(String(c.value))));
    expectBlind("site template", cells.join("\n"));
  }, 60_000);

  it("the page works for the grower in a browser, with blind codes in the tables", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, GROWER.grower.email, DEMO_PASSWORDS.cooperator);
    await page.goto(`/portal/trials/${trialId}/analysis`);
    await page.getByRole("heading", { name: /^Analysis: / }).waitFor();
    const table = page.getByRole("table", { name: `Entry means at ${GROWER.name}` });
    const summary = page.locator("summary", { hasText: GROWER.name }).first();
    await summary.waitFor();
    // The grower's one site opens by itself and fetches its tables; open it only if it is closed (its tables may still be loading).
    if (!(await summary.evaluate((s) => (s.parentElement as HTMLDetailsElement).open))) await summary.click();
    await table.waitFor();
    expect(await table.locator("tbody tr").count()).toBe(SPINACH.entries.length);
    expect(await page.getByText("Show variety names instead of blind codes").count()).toBe(0);
    expectBlind("rendered page", await page.content());
    await context.close();
  }, 90_000);
});
