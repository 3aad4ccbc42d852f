import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { baseUrl, launchBrowser, newPage } from "../helpers/browser";
import { createDatabase } from "@/db/client";
import { DEMO_TRIALS } from "@/db/demo-data";

// The demo ships a published spring trial. For a trait of each direction (higher is better, lower is
// better, no preference) the public trial page, the open data API and the public variety page must agree
// on who comes first, and that must be what the plot data say: for days to emergence the earliest ranks 1.

const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
const TRIAL = DEMO_TRIALS.find((t) => t.publishedAtSeed)!;
const CASES = [
  { trait: "emerged_final", betterWhen: "higher", firstIs: "most" },
  { trait: "emergence_date", betterWhen: "lower", firstIs: "least" },
  { trait: "harvest_date", betterWhen: "neither", firstIs: "least" },
] as const;

interface ApiMean { entry: string; variety: string; mean: number; rank: number | null; groupLetters: string | null; percentOfCheck: number | null }
interface ApiTraitResult { trait: string; name: string; betterWhen: string; result: { means: ApiMean[] } }
interface ApiPlot { entry: string; variety: string; trait: string; value: number | null; status: string }

let browser: Browser;
let results: ApiTraitResult[];
let plots: ApiPlot[];
let varietyIds: Map<string, number>;

const api = async <T,>(path: string): Promise<T> => {
  const res = await fetch(new URL(path, baseUrl));
  expect(res.status, path).toBe(200);
  return (await res.json()) as T;
};

beforeAll(async () => {
  browser = await launchBrowser();
  results = (await api<{ results: ApiTraitResult[] }>(`/api/public/v1/trials/${TRIAL.code}/results`)).results;
  plots = (await api<{ plots: ApiPlot[] }>(`/api/public/v1/trials/${TRIAL.code}/plots`)).plots;
  const [rows] = (await e2e.pool.query(
    "SELECT v.name, v.id FROM varieties v JOIN trial_entries te ON te.variety_id = v.id JOIN trials t ON t.id = te.trial_id WHERE t.code = ?",
    [TRIAL.code],
  )) as unknown as [{ name: string; id: number }[]];
  varietyIds = new Map(rows.map((r) => [r.name, r.id]));
});
afterAll(async () => {
  await browser?.close();
  await e2e.pool.end();
});

/** The variety whose plot values average highest or lowest for a trait (every plot used, none missing). */
function extremeFromPlots(trait: string, which: "most" | "least"): string {
  const byVariety = new Map<string, number[]>();
  for (const p of plots.filter((x) => x.trait === trait && x.status === "used" && x.value !== null)) byVariety.set(p.variety, [...(byVariety.get(p.variety) ?? []), p.value!]);
  const averages = [...byVariety].map(([variety, v]) => ({ variety, mean: v.reduce((a, b) => a + b, 0) / v.length }));
  averages.sort((a, b) => (which === "most" ? b.mean - a.mean : a.mean - b.mean));
  expect(averages[0]!.mean).not.toBe(averages[1]!.mean);
  return averages[0]!.variety;
}

/** The cells of the first row of a trait's means table on the public trial page, by column name. */
async function firstRowOf(page: Page, trait: string): Promise<Record<string, string>> {
  const table = page.locator(`section[aria-labelledby="trait-${trait}"] [data-testid="public-means"]`);
  const headers = (await table.locator("thead th").allInnerTexts()).map((h) => h.replace(/[↕↑↓]/g, "").trim());
  const cells = await table.locator("tbody tr").first().locator("td").allInnerTexts();
  return Object.fromEntries(headers.map((h, i) => [h, cells[i]!.trim()]));
}

describe("who comes first follows the trait's direction, on every public surface", () => {
  for (const c of CASES) {
    it(`${c.betterWhen === "neither" ? "no preference" : `${c.betterWhen} is better`} (${c.trait}): the trial page, the API and the variety page agree, and match the plot data`, async () => {
      const expected = extremeFromPlots(c.trait, c.firstIs);
      const result = results.find((r) => r.trait === c.trait)!;
      expect(result.betterWhen).toBe(c.betterWhen);

      // the open data API
      const first = result.result.means[0]!;
      expect(first.variety).toBe(expected);
      if (c.betterWhen === "neither") expect(result.result.means.every((m) => m.rank === null)).toBe(true);
      else {
        expect(first.rank).toBe(1);
        expect(result.result.means.filter((m) => m.rank === 1).map((m) => m.variety)).toEqual([expected]);
      }

      // the public trial page
      const { page, context } = await newPage(browser);
      await page.goto(`/results/${TRIAL.code}`);
      const row = await firstRowOf(page, c.trait);
      expect(row.Variety).toContain(expected);
      const sentence = await page.locator(`section[aria-labelledby="trait-${c.trait}"] [data-testid="order-sentence"]`).innerText();
      if (c.betterWhen === "neither") {
        expect(row.Rank).toBeUndefined();
        expect(sentence).toMatch(/no variety is ranked or called best/);
      } else {
        expect(row.Rank).toBe("1");
        expect(sentence).toMatch(c.betterWhen === "lower" ? /earliest first: earlier is better/ : /highest first: higher is better/);
      }

      // the public variety page of that variety
      await page.goto(`/varieties/${varietyIds.get(expected)}`);
      expect(await page.getByText(/Rank 1 is the highest mean/).count()).toBe(0);
      const traitRow = page.locator("tbody tr").filter({ hasText: result.name }).last();
      expect(await traitRow.innerText()).toMatch(c.betterWhen === "neither" ? /not ranked/ : /\b1 of 5\b/);
      await context.close();
    });
  }
});

describe("public tables read on a phone", () => {
  it("a trait's means on a 390 px phone show group letters and % of check without scrolling sideways", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await page.goto(`/results/${TRIAL.code}`);
    const table = page.locator('section[aria-labelledby="trait-marketable_yield"] [data-testid="public-means"]');
    const card = table.locator("tbody tr").first();
    for (const label of ["Group", "% of check"]) {
      const cell = card.locator(`td[data-label="${label}"]`);
      expect(await cell.isVisible()).toBe(true);
      expect((await cell.innerText()).replace(label, "").trim()).toMatch(label === "Group" ? /^[a-z]+$/ : /^\d[\d,]*%$/);
      const box = (await cell.boundingBox())!;
      expect(box.x + box.width).toBeLessThanOrEqual(390);
    }
    // nothing on the page, the table's own box included, is wider than the screen
    const widths = await table.evaluate((el) => {
      const boxes = [el, el.parentElement!, document.documentElement];
      return boxes.map((b) => ({ scroll: b.scrollWidth, client: b.clientWidth }));
    });
    for (const w of widths) expect(w.scroll).toBeLessThanOrEqual(w.client);
    await context.close();
  });
});
