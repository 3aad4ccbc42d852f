import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { UPLOAD_CORPUS, type CorpusContext } from "../helpers/bad-uploads";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";

// A grower on a phone uploads sheets the corpus says must be refused and reads what the page tells them.

const PHONE = { width: 390, height: 844 };
const shots = path.resolve("tests/output/upload-messages");
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  mkdirSync(shots, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

const variant = (name: string) => UPLOAD_CORPUS.find((v) => v.name === name)!;

describe("a grower on a phone uploads a sloppy sheet", () => {
  it("is told in plain words what is wrong with a macro workbook, a sheet without headings and a duplicated plot, and which sheet of a workbook was read", async () => {
    const { page, context } = await newPage(browser, PHONE);
    await signIn(page, "tomas@willowbend.example", "seedplot-grower-demo");
    await page.goto("/portal/record");
    await page.getByRole("link", { name: /Willow Bend Farm.*Baby-leaf kale/ }).click();
    await page.getByRole("heading", { name: /Willow Bend Farm: Baby-leaf kale/ }).waitFor();
    const templateHref = await page.getByRole("link", { name: "Download spreadsheet (.xlsx)" }).getAttribute("href");
    const template = new Uint8Array(await (await page.request.get(templateHref!)).body());
    const grid = parseCsv(await (await page.request.get(templateHref!.replace(/template$/, "export"))).text()).filter((r) => r.some((c) => c !== ""));
    const headings: Record<string, string> = { quality: "Overall quality", marketable_yield: "Marketable yield", harvest_date: "First harvest date", "emergence_count@5": "Seedlings emerged (count) day 5" };
    const ctx: CorpusContext = { template, grid, foreignPlotCode: "ZZ-9-99", columnOf: (key) => grid[0]!.findIndex((h) => h.startsWith(headings[key] ?? key)) + 1 };

    await page.getByRole("link", { name: "Upload a filled-in sheet" }).click();
    await page.getByRole("heading", { name: "Upload a filled-in sheet" }).waitFor();
    const choose = async (name: string) => {
      await page.getByLabel(/Spreadsheet \(\.xlsx or \.csv/).setInputFiles({ name, mimeType: "application/octet-stream", buffer: Buffer.from(await variant(name).build(ctx)) });
      await page.getByRole("button", { name: "Check the file" }).click();
    };
    const noSidewaysScroll = () => page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth);

    await choose("macros-renamed.xlsx");
    const refusal = page.getByRole("alert").filter({ hasText: "This file cannot be used. Nothing was saved." });
    await refusal.waitFor();
    expect(await refusal.innerText()).toMatch(/This workbook contains macros \(it is a macro-enabled workbook, whatever its name says\).*File → Save As → Excel Workbook \(\.xlsx\)/s);
    expect(await noSidewaysScroll()).toBe(true);
    await refusal.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(shots, "phone-macro-workbook.png"), fullPage: true });

    await choose("no-heading-row.csv");
    await refusal.filter({ hasText: "Row 1 must hold the column headings" }).waitFor();
    const text = await refusal.innerText();
    expect(text).toMatch(/heading row seems to be missing\. Copy row 1 from a fresh template/);
    expect(text).not.toMatch(/is not one of this trial's columns/);
    expect(await noSidewaysScroll()).toBe(true);
    await page.screenshot({ path: path.join(shots, "phone-no-heading-row.png"), fullPage: true });

    await choose("conflicting-duplicate.csv");
    const problems = page.getByRole("alert").filter({ hasText: "problem needs fixing before anything can be saved" });
    await problems.waitFor();
    expect(await problems.innerText()).toMatch(new RegExp(`Row ${grid.length + 1}, column A \\(Plot\\): Plot ${grid[3]![0]} is on row 4 and again on row ${grid.length + 1}, and the two rows disagree in column [A-Z]+ \\(Marketable yield`));
    expect(await page.getByRole("button", { name: /^Save \d+ values$/ }).count()).toBe(0);
    expect(await noSidewaysScroll()).toBe(true);
    await page.screenshot({ path: path.join(shots, "phone-conflicting-duplicate.png"), fullPage: true });

    // A workbook whose first sheet is the grower's own table is read from the plot sheet, and the page says so.
    await choose("notes-first.xlsx");
    await page.getByText("Read from the sheet “Plots”. Not read: “Weather”, “Data dictionary”.").waitFor();
    expect(await noSidewaysScroll()).toBe(true);
    await page.screenshot({ path: path.join(shots, "phone-sheet-read.png"), fullPage: true });
    await context.close();
  }, 90_000);
});
