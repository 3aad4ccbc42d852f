import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import mysql from "mysql2/promise";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_STAFF } from "@/db/demo-data";
import { planTrial } from "@/lib/domain/stats";
import { formatNumber } from "@/lib/domain/analysis/format";

let browser: Browser;
const ids: Record<string, number> = {};
beforeAll(async () => {
  browser = await launchBrowser();
  const connection = await mysql.createConnection(process.env.E2E_DATABASE_URL ?? process.env.DATABASE_URL!);
  const [rows] = await connection.query("SELECT id, code FROM trials WHERE code IN ('TV26-LET', 'JF27-LET')");
  for (const r of rows as { id: number; code: string }[]) ids[r.code] = r.id;
  await connection.end();
});
afterAll(async () => {
  await browser?.close();
});

describe("stability and planning in a real browser", () => {
  it("the analysis page shows each variety's slope, Shukla's variance and a plain reading, and a GGE biplot with a text alternative", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto(`/portal/trials/${ids["TV26-LET"]}/analysis`);
    const table = page.getByTestId("stability-table");
    await table.waitFor();
    expect(await table.locator("tbody tr").count()).toBe(6);
    expect(await table.locator("thead").innerText()).toMatch(/Slope on site mean \(1 = average\)[\s\S]*Shukla's variance[\s\S]*What it means/);
    expect(await table.locator("tbody").innerText()).toMatch(/Responds|Holds steadier|Swings/);
    expect(await page.getByTestId("stability-notes").innerText()).toMatch(/With only \d sites, each slope rests on \d points/);
    const biplot = page.getByTestId("gge-biplot");
    // the drawing is hidden from screen readers, which read the description and the table instead
    await biplot.locator('[aria-hidden="true"] svg').first().waitFor();
    expect(await biplot.locator("[data-chart-summary]").innerText()).toMatch(/The first two components explain \d+% and \d+% \(\d+% together\)/);
    await biplot.getByText("Biplot numbers").click();
    expect(await biplot.locator("table tbody tr").count()).toBeGreaterThanOrEqual(6 + 3);
    expect(await page.getByTestId("site-response-chart").locator("[data-chart-summary]").innerText()).toMatch(/Slopes \(1 = average response\): /);
    await context.close();
  });

  it("a coordinator planning a draft trial sees the power and the fewest blocks for 80% from a typed CV, in plain words", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, "owen.marsh@juniper-flats.example", DEMO_PASSWORDS.coordinator);
    await page.goto(`/portal/trials/${ids["JF27-LET"]}`);
    const panel = page.getByTestId("planning");
    await panel.waitFor();
    // no other lettuce trial in this program has data, so the CV is typed
    expect(await panel.innerText()).toMatch(/None of your other trials of this crop has recorded values yet/);
    const text = await panel.innerText();
    const [, entries, blocks, sites] = text.match(/This trial now has (\d+) entr\w+, (\d+) blocks? per site and (\d+) enrolled sites?/)!;
    await panel.getByLabel("CV (%)").fill("10");
    await panel.getByLabel("Difference worth detecting (% of the mean)").fill("20");
    const expected = planTrial({ cv: 10, mean: 100, difference: 20, entries: Number(entries), blocks: Number(blocks), sites: Number(sites) });
    const result = panel.getByTestId("planning-result");
    await result.getByText(/its power is/).waitFor();
    const words = await result.innerText();
    expect(words).toContain(`its power is ${formatNumber(100 * expected.power, 0)}%`);
    expect(words).toMatch(expected.blocksForPower80 === null ? /No trial of up to 50 blocks/ : new RegExp(`${expected.blocksForPower80} blocks? per site would`));
    expect(words).toMatch(/Assumptions: plot-to-plot variation like a CV of 10\.0% at every site/);
    await panel.getByLabel("CV (%)").fill("-3");
    await result.getByText("The CV must be above 0.").waitFor();
    await context.close();
  });
});
