import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, count, desc, eq, gt, like, sql } from "drizzle-orm";
import * as s from "@/db/schema";
import { pool as appPool } from "@/db/index";
import { publishResults, withdrawResults } from "@/server/publish/publish";
import { getPublicReport, getPublicSite, getPublicVariety, listPublicTrials } from "@/server/publish/public-snapshots";
import { buildSnapshot } from "@/server/publish/build";
import { renderTrialReport } from "@/reports/trial-report/render";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";

const { db, pool } = testDatabase();
// The spinach trial is published here from scratch. The demo ships it published, so this file sets aside
// its stored versions and status first and puts them back afterwards, with the yield value it edits.
const TRIAL = DEMO_TRIALS.find((t) => t.code === "TV26-SPN")!;
let coordinator: Viewer;
let trialId: number;
let shipped: { reports: (typeof s.publishedReports.$inferSelect)[]; status: (typeof s.trials.$inferSelect)["status"] };
let editedYield: { id: number; value: number } | null = null;
// The last outbox row before these tests, so only the mail they queue is counted.
let mailMark = 0;

async function publish(changeNote: string | null) {
  return publishResults(coordinator, { trialId, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote });
}

beforeAll(async () => {
  const [u] = await db.select({ id: s.users.id, email: s.users.email, name: s.users.name, role: s.users.role }).from(s.users).where(eq(s.users.email, DEMO_STAFF[1].email));
  coordinator = u!;
  const [t] = await db.select({ id: s.trials.id, status: s.trials.status }).from(s.trials).where(eq(s.trials.code, TRIAL.code));
  trialId = t!.id;
  shipped = { reports: await db.select().from(s.publishedReports).where(eq(s.publishedReports.trialId, trialId)), status: t!.status };
  await db.delete(s.publishedReports).where(eq(s.publishedReports.trialId, trialId));
  await db.update(s.trials).set({ status: "analysing" }).where(eq(s.trials.id, trialId));
  const [last] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = last?.id ?? 0;
});

const cooperatorsOfTrial = () =>
  db
    .selectDistinct({ email: s.users.email })
    .from(s.enrolments)
    .innerJoin(s.siteCooperators, eq(s.siteCooperators.siteId, s.enrolments.siteId))
    .innerJoin(s.users, eq(s.users.id, s.siteCooperators.userId))
    .where(and(eq(s.enrolments.trialId, trialId), eq(s.users.active, true), sql`${s.users.passwordHash} IS NOT NULL`));
const queuedSince = (mark: number) => db.select({ to: s.mailOutbox.toAddress, subject: s.mailOutbox.subject, text: s.mailOutbox.textBody }).from(s.mailOutbox).where(gt(s.mailOutbox.id, mark));
afterAll(async () => {
  // The notices stay out of other files' delivery runs.
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), like(s.mailOutbox.subject, "Results published:%")));
  if (editedYield) await db.update(s.observations).set({ valueNumber: editedYield.value }).where(eq(s.observations.id, editedYield.id));
  await db.delete(s.publishedReports).where(eq(s.publishedReports.trialId, trialId));
  if (shipped.reports.length > 0) await db.insert(s.publishedReports).values(shipped.reports);
  await db.update(s.trials).set({ status: shipped.status }).where(eq(s.trials.id, trialId));
  await pool.end();
  await appPool.end();
});

describe("publishing a trial", () => {
  it("keeps the published report unchanged by later data edits until it is republished as version 2", async () => {
    expect(await getPublicReport(TRIAL.code)).toBeNull();
    const first = await publish(null);
    expect(first.version).toBe(1);

    const v1 = await getPublicReport(TRIAL.code);
    expect(v1?.kind).toBe("published");
    if (v1?.kind !== "published") return;
    expect(v1.snapshot.entries.map((e) => e.variety).sort()).toEqual(TRIAL.entries.map((e) => e.variety).sort());
    const yieldResult = v1.snapshot.results.find((r) => r.result.trait.name === "Marketable yield")!.result;
    const before = JSON.stringify(yieldResult.combined!.means);

    // A grower's value changes after publication.
    const [plot] = await db
      .select({ id: s.observations.id, value: s.observations.valueNumber })
      .from(s.observations)
      .innerJoin(s.plots, eq(s.plots.id, s.observations.plotId))
      .innerJoin(s.traits, eq(s.traits.id, s.observations.traitId))
      .where(and(eq(s.plots.trialId, trialId), eq(s.traits.code, "marketable_yield"), sql`${s.observations.valueNumber} IS NOT NULL`))
      .limit(1);
    editedYield = { id: plot!.id, value: plot!.value! };
    await db.update(s.observations).set({ valueNumber: plot!.value! + 5000 }).where(eq(s.observations.id, plot!.id));

    const still = await getPublicReport(TRIAL.code);
    if (still?.kind !== "published") throw new Error("expected published");
    expect(JSON.stringify(still.snapshot.results.find((r) => r.result.trait.name === "Marketable yield")!.result.combined!.means)).toBe(before);
    expect(still.latestVersion).toBe(1);

    await expect(publish(null)).rejects.toThrow(/what changed/i);
    const second = await publish("Corrected a yield value at one site.");
    expect(second.version).toBe(2);
    const v2 = await getPublicReport(TRIAL.code);
    if (v2?.kind !== "published") throw new Error("expected published");
    expect(v2.snapshot.version).toBe(2);
    expect(v2.snapshot.changeNote).toBe("Corrected a yield value at one site.");
    expect(JSON.stringify(v2.snapshot.results.find((r) => r.result.trait.name === "Marketable yield")!.result.combined!.means)).not.toBe(before);
    expect(v2.versions.map((v) => v.version)).toEqual([2, 1]);
    // Version 1 stays readable as it was.
    const old = await getPublicReport(TRIAL.code, 1);
    if (old?.kind !== "published") throw new Error("expected version 1");
    expect(JSON.stringify(old.snapshot.results.find((r) => r.result.trait.name === "Marketable yield")!.result.combined!.means)).toBe(before);
  }, 60_000);

  it("renders a PDF that names every variety and carries the summary", async () => {
    const report = await getPublicReport(TRIAL.code);
    if (report?.kind !== "published") throw new Error("expected published");
    const pdf = await renderTrialReport(report.snapshot);
    const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-report-"));
    const file = path.join(dir, "report.pdf");
    await fs.writeFile(file, pdf);
    const text = execFileSync("pdftotext", ["-layout", file, "-"]).toString();
    for (const entry of TRIAL.entries) expect(text).toContain(entry.variety);
    expect(text).toContain("Summary for growers");
    expect(text).toContain(report.snapshot.summary[0]!.slice(0, 30));
    expect(text).toMatch(/Page 1 of \d+/);
    // The contents page numbers point at the pages where the sections really start.
    const contents = execFileSync("pdftotext", ["-f", "1", "-l", "1", "-layout", file, "-"]).toString();
    const entries = [...contents.matchAll(/^(Summary for growers|Methods|Site-by-site results|Cautions and disclaimer)\s+(\d+)\s*$/gm)];
    expect(entries.map((m) => m[1])).toEqual(["Summary for growers", "Methods", "Site-by-site results", "Cautions and disclaimer"]);
    for (const [, title, page] of entries) {
      expect(execFileSync("pdftotext", ["-f", page!, "-l", page!, file, "-"]).toString()).toContain(title);
    }
    // Rendered to images as a grower would see it.
    execFileSync("pdftoppm", ["-png", "-r", "40", file, path.join(dir, "page")]);
    expect((await fs.readdir(dir)).filter((n) => n.endsWith(".png")).length).toBeGreaterThan(3);
    if (process.env.SEEDPLOT_KEEP_PDF) await fs.copyFile(file, process.env.SEEDPLOT_KEEP_PDF);
  }, 60_000);

  it("lists published trials, varieties and sites publicly without contact details", async () => {
    const index = await listPublicTrials({ q: "spinach" });
    expect(index.trials.map((t) => t.code)).toContain(TRIAL.code);
    expect((await listPublicTrials({ q: "no-such-variety-anywhere" })).trials).toEqual([]);
    const report = await getPublicReport(TRIAL.code);
    if (report?.kind !== "published") throw new Error("expected published");
    const variety = await getPublicVariety(report.snapshot.entries[0]!.varietyId);
    expect(variety?.trials.map((t) => t.code)).toEqual([TRIAL.code]);
    const site = await getPublicSite(report.snapshot.sites[0]!.id);
    expect(site?.site.name).toBe(report.snapshot.sites[0]!.name);
    const serialised = JSON.stringify(report.snapshot) + JSON.stringify(site);
    expect(serialised).not.toMatch(/@|555-01|contact/i);
  });

  it("withdraws the results with a reason and shows a notice instead", async () => {
    await withdrawResults(coordinator, { trialId, reason: "A labelling mix-up at one site is being checked." });
    const notice = await getPublicReport(TRIAL.code);
    expect(notice?.kind).toBe("withdrawn");
    if (notice?.kind === "withdrawn") expect(notice.reason).toContain("labelling mix-up");
    expect(await getPublicReport(TRIAL.code, 1)).toBeNull();
    expect((await listPublicTrials({})).trials.map((t) => t.code)).not.toContain(TRIAL.code);
    await expect(withdrawResults(coordinator, { trialId, reason: "again and again" })).rejects.toThrow(/no published results/);
  });

  it("queues a notice to each of the trial's cooperators with every version it publishes", async () => {
    const cooperators = (await cooperatorsOfTrial()).map((c) => c.email).sort();
    expect(cooperators.length).toBeGreaterThan(0);
    const notices = (await queuedSince(mailMark)).filter((m) => m.subject === `Results published: ${TRIAL.title}`);
    expect(notices.filter((m) => !/version 2/.test(m.text)).map((m) => m.to).sort()).toEqual(cooperators);
    expect(notices.filter((m) => /version 2/.test(m.text)).map((m) => m.to).sort()).toEqual(cooperators);
    for (const m of notices) expect(m.text).toContain(`/results/${TRIAL.code}`);
  });

  it("a publication refused under the trial's lock stores no version, leaves the status and queues no notice", async () => {
    const [before] = await db.select({ status: s.trials.status }).from(s.trials).where(eq(s.trials.id, trialId));
    const [last] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
    const versionsBefore = await db.select({ n: count() }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trialId));
    await db.update(s.trials).set({ status: "archived" }).where(eq(s.trials.id, trialId));
    try {
      await expect(publishResults(coordinator, { trialId, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: "Tried on an archived trial." })).rejects.toThrow(/archived trial cannot be published/);
      expect(await db.select({ n: count() }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trialId))).toEqual(versionsBefore);
      expect(await queuedSince(last?.id ?? 0)).toEqual([]);
      const [after] = await db.select({ status: s.trials.status }).from(s.trials).where(eq(s.trials.id, trialId));
      expect(after!.status).toBe("archived");
    } finally {
      await db.update(s.trials).set({ status: before!.status }).where(eq(s.trials.id, trialId));
    }
  });

  it("refuses a coordinator of another program and cooperators", async () => {
    const grower: Viewer = { id: 999999, email: "x@example.org", name: "X", role: "cooperator" };
    await expect(buildSnapshot(grower, { trialId, traitId: null, settings: { siteModel: "random", separation: "lsd" }, version: 1, changeNote: null, publishedAt: new Date() })).rejects.toThrow(/not in your programs/);
    const [other] = await db.insert(s.users).values({ email: `other-coord-${Date.now()}@example.org`, name: "Other", role: "coordinator" }).$returningId();
    const outsider: Viewer = { id: other!.id, email: "o@example.org", name: "Other", role: "coordinator" };
    await expect(withdrawResults(outsider, { trialId, reason: "not my trial at all" })).rejects.toThrow(/not in your programs/);
    // Refused before anything is built, even though the trial has versions (no change-note hint about them).
    await expect(publishResults(outsider, { trialId, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: null })).rejects.toThrow(/not in your programs/);
    await expect(publishResults(grower, { trialId, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: null })).rejects.toThrow(/not in your programs/);
  });
});
