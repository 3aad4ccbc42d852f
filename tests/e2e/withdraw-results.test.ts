import { afterAll, beforeAll, describe, it } from "vitest";
import type { Browser } from "playwright-core";
import { and, eq } from "drizzle-orm";
import { launchBrowser, newPage, signIn } from "../helpers/browser";
import { createDatabase } from "@/db/client";
import * as s from "@/db/schema";
import { DEMO_PASSWORDS, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";

// The browser tests' server reads the seedplot_e2e database; the withdrawal is undone here afterwards so
// the other files still find the seeded publication live.
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
const PUBLISHED_AT_SEED = DEMO_TRIALS.find((t) => t.publishedAtSeed)!;
const REASON = "A labelling mix-up at one site is being checked.";
let browser: Browser;
let trialId: number;

beforeAll(async () => {
  browser = await launchBrowser();
  const [trial] = await e2e.db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, PUBLISHED_AT_SEED.code));
  trialId = trial!.id;
});
afterAll(async () => {
  await e2e.pool.query("UPDATE published_reports SET unpublished_at = NULL, unpublish_reason = NULL WHERE trial_id = ? AND unpublish_reason = ?", [trialId, REASON]);
  await e2e.db.update(s.trials).set({ status: "published" }).where(eq(s.trials.id, trialId));
  await e2e.db.delete(s.auditLog).where(and(eq(s.auditLog.trialId, trialId), eq(s.auditLog.action, "unpublish")));
  await e2e.pool.query("UPDATE public_generation SET stamp = UUID()");
  await browser?.close();
  await e2e.pool.end();
});

describe("a coordinator withdraws published results", () => {
  it("the withdrawal's confirmation stays on the page after it refreshes without the withdraw form", async () => {
    const { page, context } = await newPage(browser);
    await signIn(page, DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
    await page.goto(`/portal/trials/${trialId}/publish`);
    await page.getByLabel("Why are the results withdrawn?").fill(REASON);
    await page.getByRole("button", { name: "Withdraw the results" }).click();
    // The page refreshes with every version withdrawn; the grower-facing reason is listed under the version.
    await page.getByText(`Withdrawn: ${REASON}`).waitFor({ timeout: 20_000 });
    await page.getByRole("status").getByText("The results are withdrawn. The public page now shows your reason.").waitFor({ timeout: 5_000 });
    await context.close();
  }, 60_000);
});
