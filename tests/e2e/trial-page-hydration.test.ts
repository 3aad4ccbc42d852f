import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { DEMO_PASSWORDS, DEMO_STAFF } from "@/db/demo-data";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the coordinator's trial page", () => {
  it("hydrates without errors: the sites' consent forms sit where the server put them", async () => {
    const { page, context } = await newPage(browser);
    const problems: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error") problems.push(m.text());
    });
    page.on("pageerror", (e) => problems.push(e.message));
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    const { trials } = (await (await page.request.get("/api/trials")).json()) as { trials: { id: number; code: string }[] };
    await page.goto(`/portal/trials/${trials.find((t) => t.code === "TV27-KAL")!.id}`);
    const consent = page.getByRole("button", { name: /^Grower (agreed to be named|withdrew consent) \(.+\)$/ }).first();
    await consent.waitFor();
    // The form is the markup's own, not one the browser moved out of a paragraph.
    expect(await consent.evaluate((el) => el.closest("p") === null)).toBe(true);
    await page.waitForLoadState("networkidle");
    expect(problems).toEqual([]);
    await context.close();
  }, 60_000);

  it("recording that a grower withdrew consent (or gave it) says what the next version does, and the answer can be turned back", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    const { trials } = (await (await page.request.get("/api/trials")).json()) as { trials: { id: number; code: string }[] };
    await page.goto(`/portal/trials/${trials.find((t) => t.code === "TV27-KAL")!.id}`);
    const row = page.getByRole("listitem").filter({ has: page.getByRole("button", { name: /\(Brightwater Flower Farm\)$/ }) });
    const answers = { named: "The site will be named in the next published version.", unnamed: 'The site will be published as "Site N, region" from the next version on.' };
    const first = (await row.getByRole("button", { name: /^Grower withdrew consent/ }).count()) > 0 ? "unnamed" : "named";
    await row.getByRole("button", { name: first === "unnamed" ? /^Grower withdrew consent/ : /^Grower agreed to be named/ }).click();
    await row.getByRole("status").getByText(answers[first]).waitFor({ timeout: 15_000 });
    const back = first === "unnamed" ? "named" : "unnamed";
    await row.getByRole("button", { name: back === "unnamed" ? /^Grower withdrew consent/ : /^Grower agreed to be named/ }).click();
    await row.getByRole("status").getByText(answers[back]).waitFor({ timeout: 15_000 });
    await context.close();
  }, 60_000);
});
