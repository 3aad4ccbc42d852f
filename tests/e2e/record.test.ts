import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { promises as fs } from "node:fs";
import ExcelJS from "exceljs";
import { launchBrowser, newPage, signIn } from "../helpers/browser";

const GROWER_PASSWORD = "seedplot-grower-demo";
let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function openKaleSite(page: Page, siteName: string) {
  await page.goto("/portal/record");
  const card = page.getByRole("link", { name: new RegExp(`${siteName}.*Baby-leaf kale`) });
  await card.waitFor();
  await card.click();
  await page.getByRole("heading", { name: new RegExp(`${siteName}: Baby-leaf kale`) }).waitFor();
}

async function waitForMailTo(address: string, subject: RegExp, timeoutMs = 15_000) {
  const dir = process.env.E2E_MAILBOX_DIR!;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const names = await fs.readdir(dir).catch(() => [] as string[]);
    for (const n of names) {
      const mail = JSON.parse(await fs.readFile(`${dir}/${n}`, "utf8")) as { to: string; subject: string; text: string };
      if (mail.to.includes(address) && subject.test(mail.subject)) return mail;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`No mail to ${address}`);
}

describe("a grower records a day's counts on a phone", () => {
  it("values save as they go, a refused value says why, an offline save is retried, and all survive a reload", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await signIn(page, "dev@fernbrookschool.example", GROWER_PASSWORD);
    await openKaleSite(page, "Fernbrook School Garden");
    await page.getByText(/^Seedlings emerged \(count\), day \d+ \(was due .+\) — \d+ of \d+ plots to go$/).first().waitFor();
    // The form opens on the oldest late count.
    const chosen = await page.getByLabel("What are you recording?").inputValue();
    expect(chosen).toMatch(/^emergence_count@\d+$/);

    const inputs = page.locator("[data-entry-input]");
    await inputs.first().waitFor();
    const values = ["4", "5", "3"];
    for (let i = 0; i < values.length; i += 1) {
      await inputs.nth(i).fill(values[i]!);
      await inputs.nth(i).press("Enter");
    }
    for (let i = 0; i < values.length; i += 1) {
      const state = page.locator(`#${await inputs.nth(i).getAttribute("id")}-state`);
      await expect.poll(() => state.textContent(), { timeout: 15_000 }).toBe("Saved");
    }

    // The server refuses more seedlings than seeds sown, and the message sits under the field.
    await inputs.nth(3).fill("9");
    await inputs.nth(3).press("Enter");
    const state3 = page.locator(`#${await inputs.nth(3).getAttribute("id")}-state`);
    await expect.poll(() => state3.textContent(), { timeout: 15_000 }).toMatch(/9 seedlings emerged is more than the 6 seeds sown/);

    // A save while the signal is gone is kept and shown, then goes through on retry.
    await context.setOffline(true);
    await inputs.nth(4).fill("2");
    await inputs.nth(4).press("Enter");
    await page.getByText("No signal. 1 value is waiting on this phone and goes by itself when the signal is back.").waitFor();
    // Coming back online retries by itself (the button does the same on demand).
    await context.setOffline(false);
    await page.getByText("Values save as you go.").waitFor({ timeout: 30_000 });

    // A plot with no value gets a reason instead.
    const id5 = await inputs.nth(5).getAttribute("id");
    const plot5 = page.locator("li", { has: page.locator(`#${id5}`) });
    const state5 = page.locator(`#${id5}-state`);
    await plot5.getByRole("button", { name: /^No value\? .+: say why$/ }).click();
    await plot5.getByLabel(/No value because/).selectOption({ label: "Eaten or damaged by animals" });
    await expect.poll(() => state5.textContent(), { timeout: 15_000 }).toBe("Saved");

    await page.reload();
    await inputs.first().waitFor();
    expect(await page.getByLabel("What are you recording?").inputValue()).toBe(chosen);
    for (let i = 0; i < values.length; i += 1) expect(await inputs.nth(i).inputValue()).toBe(values[i]);
    expect(await inputs.nth(3).inputValue()).toBe("");
    expect(await inputs.nth(4).inputValue()).toBe("2");
    expect(await inputs.nth(5).inputValue()).toBe("");
    expect(await plot5.getByLabel(/No value because/).inputValue()).toBe("animal_damage");
    await context.close();
  }, 90_000);
});

describe("a grower uploads a sheet with a mistake", () => {
  it("the preview names the row and column and nothing is saved", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, "tomas@willowbend.example", GROWER_PASSWORD);
    await openKaleSite(page, "Willow Bend Farm");
    const templateHref = await page.getByRole("link", { name: "Download spreadsheet (.xlsx)" }).getAttribute("href");
    const res = await page.request.get(templateHref!);
    expect(res.status()).toBe(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await res.body()) as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Plots")!;
    const header = (ws.getRow(1).values as unknown[]).slice(1).map(String);
    const quality = header.indexOf("Overall quality [1-9]") + 1;
    ws.getCell(2, quality).value = 6;
    ws.getCell(3, quality).value = "twelve";
    const file = Buffer.from(await wb.xlsx.writeBuffer());

    await page.getByRole("link", { name: "Upload a filled-in sheet" }).click();
    await page.getByRole("heading", { name: "Upload a filled-in sheet" }).waitFor();
    await page.getByLabel(/Spreadsheet \(\.xlsx or \.csv/).setInputFiles({ name: "willow-bend.xlsx", mimeType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", buffer: file });
    await page.getByRole("button", { name: "Check the file" }).click();
    const problem = page.getByText(/Row 3, column [A-Z]+ \(Overall quality \[1-9\]\): "twelve" is not a number/);
    await problem.waitFor();
    await page.getByText(/1 problem needs fixing before anything can be saved/).waitFor();
    expect(await page.getByRole("button", { name: /^Save \d+ values$/ }).count()).toBe(0);

    // Fixed, the same sheet previews one new value and saves it.
    ws.getCell(3, quality).value = null;
    await page.getByLabel(/Spreadsheet \(\.xlsx or \.csv/).setInputFiles({ name: "willow-bend.xlsx", mimeType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", buffer: Buffer.from(await wb.xlsx.writeBuffer()) });
    await page.getByRole("button", { name: "Check the file" }).click();
    await page.getByText("1 new", { exact: true }).waitFor();
    await page.getByRole("button", { name: "Save 1 values" }).click();
    await page.getByText(/Saved: 1 value recorded or corrected/).waitFor();
    await context.close();
  }, 90_000);
});

describe("a coordinator returns one value with a comment", () => {
  it("the grower is e-mailed the comment and sees it on the entry page", async () => {
    const staff = await newPage(browser);
    await signIn(staff.page, "rosa.delgado@tamarack-valley.example", "seedplot-coordinator-demo");
    await staff.page.goto("/portal/review");
    await staff.page.getByRole("heading", { name: "Review site data" }).waitFor();
    // The queue lists only trials still under review, and publish.test.ts may already have published
    // TV26-LET (file order varies between runs), so the site's review page is opened by its address.
    const { trials } = (await (await staff.page.request.get("/api/trials")).json()) as { trials: { id: number; code: string }[] };
    const { sites } = (await (await staff.page.request.get("/api/sites")).json()) as { sites: { id: number; name: string }[] };
    await staff.page.goto(`/portal/review/${trials.find((t) => t.code === "TV26-LET")!.id}/${sites.find((x) => x.name === "Three Stones Farm")!.id}`);
    await staff.page.getByRole("heading", { name: /Three Stones Farm: Leaf lettuce/ }).waitFor();
    const firstFlag = staff.page.getByRole("heading", { name: /Values to check/ }).locator("xpath=following-sibling::ul//a").first();
    const flagged = await firstFlag.textContent();
    await firstFlag.click();
    await staff.page.waitForURL(/\?plot=\d+&key=/);
    const plotCode = flagged!.split(",")[0]!.trim();
    await staff.page.getByLabel("Comment for the grower").fill("This looks far from the other plots. Please re-weigh or confirm.");
    await staff.page.getByRole("button", { name: "Add comment" }).click();
    await staff.page.getByText(/Comment added/).waitFor();
    await staff.page.getByRole("button", { name: "Return with comments" }).click();
    // The decision panel turns into the returned state once the page refreshes.
    await staff.page.getByText(/Returned to the grower; waiting for them to send it again/).waitFor();
    const mail = await waitForMailTo("kwame@threestones.example", /Please check your data/);
    expect(mail.text).toContain(`Plot ${plotCode}: This looks far from the other plots. Please re-weigh or confirm.`);
    await staff.context.close();

    const grower = await newPage(browser, { width: 390, height: 844 });
    await signIn(grower.page, "kwame@threestones.example", GROWER_PASSWORD);
    await grower.page.goto(mail.text.match(/https?:\/\/\S+\/portal\/record\/\d+\/\d+/)![0].replace(/^https?:\/\/[^/]+/, ""));
    await grower.page.getByRole("heading", { name: "Returned by your coordinator" }).waitFor();
    await grower.page.getByText(`Coordinator: This looks far from the other plots. Please re-weigh or confirm.`).waitFor();
    await grower.context.close();
  }, 90_000);
});

describe("the recording form's sticky bar on a phone", () => {
  it("a field focused just below the sticky bar is scrolled clear of it, not typed into under it", async () => {
    const { page, context } = await newPage(browser, { width: 390, height: 844 });
    await signIn(page, "dev@fernbrookschool.example", GROWER_PASSWORD);
    await openKaleSite(page, "Fernbrook School Garden");
    const inputs = page.locator("[data-entry-input]");
    await inputs.first().waitFor();
    // Whatever stays stuck to the top of the screen while the plots scroll under it.
    const sticky = () => Array.from(document.querySelectorAll("body *")).filter((el) => getComputedStyle(el).position === "sticky");
    const barBottom = () => page.evaluate(`Math.max(0, ...(${sticky.toString()})().map((el) => el.getBoundingClientRect().bottom))`) as Promise<number>;
    const barHeight = await page.evaluate(`Math.max(0, ...(${sticky.toString()})().map((el) => el.getBoundingClientRect().height))`) as number;
    expect(barHeight).toBeGreaterThan(0);
    const field = inputs.nth(Math.floor((await inputs.count()) / 2));
    // Scroll so a field halfway down the page has its top a little above the stuck bar's lower edge, still
    // inside the screen, as a grower scrolling back up leaves it, then move into it.
    await page.waitForLoadState("networkidle");
    // Scrolling settles over a frame or two while the page lays out; step until the field sits there.
    const under = barHeight - 20;
    await expect
      .poll(() =>
        field.evaluate((el, target) => {
          const off = el.getBoundingClientRect().top - target;
          if (Math.abs(off) >= 1) window.scrollBy({ top: off, behavior: "instant" });
          return Math.round(el.getBoundingClientRect().top - target);
        }, under),
      )
      .toBe(0);
    expect(await field.evaluate((el) => el.getBoundingClientRect().top)).toBeLessThan(await barBottom());
    await field.focus();
    const box = await field.evaluate((el) => el.getBoundingClientRect().top);
    expect(box).toBeGreaterThanOrEqual(await barBottom());
    await context.close();
  }, 60_000);
});
