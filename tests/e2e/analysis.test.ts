import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import mysql from "mysql2/promise";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_STAFF } from "@/db/demo-data";

let browser: Browser;
let lettuceId: number;
let spinach: { id: number; plotCode: string };
beforeAll(async () => {
  browser = await launchBrowser();
  const connection = await mysql.createConnection(process.env.E2E_DATABASE_URL ?? process.env.DATABASE_URL!);
  const [rows] = await connection.query("SELECT id FROM trials WHERE code = 'TV26-LET'");
  lettuceId = (rows as { id: number }[])[0]!.id;
  const [plots] = await connection.query(
    "SELECT t.id, p.plot_code AS plotCode FROM trials t JOIN plots p ON p.trial_id = t.id WHERE t.code = 'TV26-SPN' ORDER BY p.plot_code DESC LIMIT 1",
  );
  spinach = (plots as { id: number; plotCode: string }[])[0]!;
  await connection.end();
});
afterAll(async () => {
  await browser?.close();
});

describe("trial analysis in a real browser", () => {
  it("shows means and charts, then updates them when the trait and sites change", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto(`/portal/trials/${lettuceId}/analysis`);
    await page.getByRole("heading", { name: /^Analysis: Leaf lettuce/ }).waitFor();

    const table = page.getByTestId("means-table");
    await table.waitFor();
    expect(await table.locator("tbody tr").count()).toBe(6);
    const chart = page.getByTestId("means-chart");
    await chart.locator("svg").first().waitFor();
    const summary = chart.locator("[data-chart-summary]");
    expect(await summary.textContent()).toMatch(/Combined means: Marketable yield \(g per plot\), highest first \(higher is better\): /);

    // A site's tables are drawn when its section is opened, so a trial of many sites stays light.
    expect(await page.locator("caption", { hasText: "Entry means at Cedar Hollow Market Garden" }).count()).toBe(0);
    const siteTable = page.getByRole("table", { name: "Entry means at Cedar Hollow Market Garden" });
    await page.locator("summary", { hasText: "Cedar Hollow Market Garden" }).click();
    await siteTable.waitFor();
    expect(await siteTable.locator("tbody tr").count()).toBe(6);

    await page.getByLabel("Trait").selectOption({ label: "First harvest date" });
    await page.getByRole("heading", { name: "What the data say: First harvest date" }).waitFor();
    await chart.getByText(/Combined means: First harvest date \(days from sowing\)/).first().waitFor();
    expect(await table.locator("thead").textContent()).toContain("Mean (days)");
    expect(await page.getByTestId("interaction-chart").locator("[data-chart-summary]").textContent()).toMatch(/Earliest entry per site — /);

    await page.getByRole("heading", { name: "Across 5 sites" }).waitFor();
    await page.getByRole("checkbox", { name: /Willow Bend Farm/ }).uncheck();
    await page.getByRole("heading", { name: "Across 4 sites" }).waitFor();
    expect(page.url()).toMatch(/sites=/);

    // Staff can switch from blind codes to variety names.
    await page.getByLabel("Show variety names instead of blind codes").check();
    await table.getByText("Copper Ruffle").waitFor();
    await context.close();
  }, 90_000);

  it("a coordinator opens a site's section and reads its ANOVA, fetched for the settings on the page", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    const sectionRequests: string[] = [];
    page.on("request", (r) => {
      if (/\/analysis\/sites\/\d+/.test(r.url())) sectionRequests.push(r.url());
    });
    await page.goto(`/portal/trials/${lettuceId}/analysis?compare=tukey`);
    await page.getByRole("heading", { name: "Site by site" }).waitFor();
    expect(await page.getByText("Open a site for its entry means with letters").count()).toBe(1);
    // the first view carries no site's tables: they come when the section opens
    expect(await page.locator("caption", { hasText: "Analysis of variance at Willow Bend Farm" }).count()).toBe(0);
    expect(sectionRequests).toEqual([]);
    await page.locator("summary", { hasText: "Willow Bend Farm" }).click();
    const anova = page.getByRole("table", { name: "Analysis of variance at Willow Bend Farm" });
    await anova.waitFor();
    expect(sectionRequests).toHaveLength(1);
    expect(sectionRequests[0]).toContain("compare=tukey");
    const sources = await anova.locator("tbody tr td:first-child").allInnerTexts();
    expect(sources.map((t) => t.trim())).toEqual(["Block", "Variety", "Residual (error)"]);
    expect(await anova.locator("tbody tr").nth(1).locator("td").nth(1).innerText()).toBe("5");
    await context.close();
  }, 90_000);

  it("excludes one plot by the code on its label, refuses an unknown code, and includes it again", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto(`/portal/trials/${spinach.id}/analysis`);
    const target = page.getByLabel("Leave out");
    await target.selectOption("plot");
    await page.getByLabel("Plot code").fill("NOPE-77");
    await page.getByLabel("Public reason").selectOption({ label: "plot damaged (animals, hail, flooding)" });
    await page.getByLabel("Private note (staff only)").fill("Slugs took the seedlings");
    await page.getByRole("button", { name: "Exclude" }).click();
    await page.getByText("There is no plot NOPE-77 in this trial.").first().waitFor();
    // What was typed stays, so only the code needs fixing.
    expect(await page.getByLabel("Private note (staff only)").inputValue()).toBe("Slugs took the seedlings");
    expect(await page.getByLabel("Public reason").inputValue()).toBe("plot_damaged");

    await page.getByLabel("Plot code").fill(spinach.plotCode.toLowerCase());
    await page.getByRole("button", { name: "Exclude" }).click();
    const listed = page.getByRole("list", { name: "Exclusions" }).getByText(`Plot ${spinach.plotCode}`);
    await listed.waitFor();
    expect(await page.getByLabel("Leave out").inputValue()).toBe("");

    const row = page.getByRole("list", { name: "Exclusions" }).locator("li", { hasText: `Plot ${spinach.plotCode}` });
    // Staff see both the public reason and their own note.
    expect(await row.innerText()).toMatch(/Public reason: plot damaged \(animals, hail, flooding\)\.\s+Private note: Slugs took the seedlings/);
    await row.getByRole("button", { name: "Include again" }).click();
    await page.getByText("Nothing is excluded. Every accepted plot counts.").waitFor();
    await context.close();
  }, 90_000);
});
