import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, count, desc, eq, gt, like, sql } from "drizzle-orm";
import * as s from "@/db/schema";
import { pool as appPool } from "@/db/index";
import { publishResults, readSiteInclusion, withdrawResults } from "@/server/publish/publish";
import { leftOutSiteIds } from "@/lib/domain/publish/site-inclusion";
import { publishedCsv, publishedXlsx } from "@/lib/domain/publish/downloads";
import { deleteExclusion, insertExclusion } from "@/db/mutations/exclusions";
import { getPublicReport, getPublicSite, getPublicVariety, listPublicTrials } from "@/server/publish/public-snapshots";
import { buildSnapshot } from "@/server/publish/build";
import { listReviewQueue } from "@/server/review/sheets";
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

const SETTINGS = { siteModel: "random", separation: "lsd" } as const;
/** The sites a publication now would leave out, as the publish page names them. */
const leftOutNow = async () => leftOutSiteIds((await readSiteInclusion(coordinator, trialId))!);

/** Publishes as a coordinator who ticked the box naming the sites left out. */
async function publish(changeNote: string | null) {
  return publishResults(coordinator, { trialId, traitId: null, settings: SETTINGS, changeNote, confirmedLeftOut: await leftOutNow() });
}

// Private notes typed with two exclusions made before the first version; neither may leave the portal.
const PRIVATE_NOTE = "Private: deer got in after the neighbour left the gate open";
const SITE_NOTE = "Private: the grower sowed a week late and told me in confidence";
const exclusionIds: number[] = [];
let excludedPlot: { code: string; site: string };
let excludedSite: string;
let reviewedAgain: number;

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
  // One plot left out of marketable yield only, and one accepted site left out of bolting only.
  const [yieldTrait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  const [boltingTrait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "bolting"));
  const accepted = await db
    .select({ siteId: s.enrolments.siteId, name: s.sites.name })
    .from(s.enrolments)
    .innerJoin(s.sites, eq(s.sites.id, s.enrolments.siteId))
    .innerJoin(s.submissions, eq(s.submissions.enrolmentId, s.enrolments.id))
    .where(and(eq(s.enrolments.trialId, trialId), eq(s.submissions.status, "accepted")))
    .orderBy(s.sites.name);
  const [plot] = await db.select({ id: s.plots.id, code: s.plots.plotCode }).from(s.plots).where(and(eq(s.plots.trialId, trialId), eq(s.plots.siteId, accepted[0]!.siteId))).limit(1);
  excludedPlot = { code: plot!.code, site: accepted[0]!.name };
  excludedSite = accepted[1]!.name;
  // The demo ships every spinach site accepted; one goes back to "sent for review" for the guard's checks.
  const lastAccepted = accepted[accepted.length - 1]!;
  const [enrolment] = await db.select({ id: s.enrolments.id }).from(s.enrolments).where(and(eq(s.enrolments.trialId, trialId), eq(s.enrolments.siteId, lastAccepted.siteId)));
  reviewedAgain = enrolment!.id;
  await db.update(s.submissions).set({ status: "submitted" }).where(eq(s.submissions.enrolmentId, reviewedAgain));
  exclusionIds.push(await insertExclusion(coordinator, { trialId, siteId: null, plotId: plot!.id, traitId: yieldTrait!.id, category: "plot_damaged", note: PRIVATE_NOTE }));
  exclusionIds.push(await insertExclusion(coordinator, { trialId, siteId: accepted[1]!.siteId, plotId: null, traitId: boltingTrait!.id, category: "not_sown", note: SITE_NOTE }));
});

/** Growers of the trial's sites whose data are accepted (or, with false, not accepted). */
const cooperatorsOfTrial = (accepted: boolean) =>
  db
    .selectDistinct({ email: s.users.email })
    .from(s.enrolments)
    .innerJoin(s.siteCooperators, eq(s.siteCooperators.siteId, s.enrolments.siteId))
    .innerJoin(s.users, eq(s.users.id, s.siteCooperators.userId))
    .leftJoin(s.submissions, eq(s.submissions.enrolmentId, s.enrolments.id))
    .where(
      and(
        eq(s.enrolments.trialId, trialId),
        eq(s.users.active, true),
        sql`${s.users.passwordHash} IS NOT NULL`,
        accepted ? sql`${s.submissions.status} = 'accepted'` : sql`COALESCE(${s.submissions.status}, 'draft') <> 'accepted'`,
      ),
    );
const queuedSince = (mark: number) => db.select({ to: s.mailOutbox.toAddress, subject: s.mailOutbox.subject, text: s.mailOutbox.textBody }).from(s.mailOutbox).where(gt(s.mailOutbox.id, mark));
afterAll(async () => {
  await db.update(s.submissions).set({ status: "accepted" }).where(eq(s.submissions.enrolmentId, reviewedAgain));
  for (const id of exclusionIds) await deleteExclusion(coordinator, { trialId, exclusionId: id });
  // The notices stay out of other files' delivery runs.
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), like(s.mailOutbox.subject, "Results published:%")));
  if (editedYield) await db.update(s.observations).set({ valueNumber: editedYield.value }).where(eq(s.observations.id, editedYield.id));
  await db.delete(s.publishedReports).where(eq(s.publishedReports.trialId, trialId));
  if (shipped.reports.length > 0) await db.insert(s.publishedReports).values(shipped.reports);
  await db.update(s.trials).set({ status: shipped.status }).where(eq(s.trials.id, trialId));
  await pool.end();
  await appPool.end();
});

/** The PDF's text as pdftotext reads it, with runs of white space made single spaces. */
async function pdfText(pdf: Buffer | Uint8Array) {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-report-text-"));
  await fs.writeFile(path.join(dir, "report.pdf"), pdf);
  return execFileSync("pdftotext", [path.join(dir, "report.pdf"), "-"]).toString().replace(/\s+/g, " ");
}

const versionsOfTrial = async () => (await db.select({ n: count() }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trialId)))[0]!.n;
const lastMailId = async () => (await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1))[0]?.id ?? 0;

describe("the publishing guard", () => {
  it("publishing with a site whose data are not accepted is refused unless the confirmation names exactly the sites left out, and then stores nothing", async () => {
    const inclusion = (await readSiteInclusion(coordinator, trialId))!;
    const leftOut = inclusion.filter((x) => !x.included);
    // The demo leaves one spinach site's data sent for review, not accepted.
    expect(leftOut.map((x) => x.reason)).toEqual(["submitted"]);
    const included = inclusion.find((x) => x.included)!;
    const mark = await lastMailId();
    const attempt = (confirmedLeftOut: number[]) => publishResults(coordinator, { trialId, traitId: null, settings: SETTINGS, changeNote: null, confirmedLeftOut });
    await expect(attempt([])).rejects.toThrow(`This version would leave out ${leftOut[0]!.siteName}.`);
    // A confirmation naming another site, or more sites than are left out, is not the one asked for.
    await expect(attempt([included.siteId])).rejects.toThrow(/would now leave out/);
    await expect(attempt([leftOut[0]!.siteId, included.siteId])).rejects.toThrow(/would now leave out/);
    expect(await versionsOfTrial()).toBe(0);
    expect(await queuedSince(mark)).toEqual([]);
  });

  it("a confirmation made before a site was accepted is refused, so a stale form cannot publish a different set of sites", async () => {
    const leftOut = await leftOutNow();
    const [enrolment] = await db.select({ id: s.enrolments.id }).from(s.enrolments).where(and(eq(s.enrolments.trialId, trialId), eq(s.enrolments.siteId, leftOut[0]!)));
    await db.update(s.submissions).set({ status: "accepted" }).where(eq(s.submissions.enrolmentId, enrolment!.id));
    try {
      await expect(publishResults(coordinator, { trialId, traitId: null, settings: SETTINGS, changeNote: null, confirmedLeftOut: leftOut })).rejects.toThrow(/Every site is now included/);
      expect(await versionsOfTrial()).toBe(0);
    } finally {
      await db.update(s.submissions).set({ status: "submitted" }).where(eq(s.submissions.enrolmentId, enrolment!.id));
    }
  });
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
      // a plot of a site whose accepted data are in the results
      .where(and(eq(s.plots.trialId, trialId), eq(s.traits.code, "marketable_yield"), sql`${s.observations.valueNumber} IS NOT NULL`, sql`${s.plots.enrolmentId} <> ${reviewedAgain}`))
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

  it("says the results come from N of M sites and names the site left out, in the public shape and the PDF", async () => {
    const report = await getPublicReport(TRIAL.code);
    if (report?.kind !== "published") throw new Error("expected published");
    const leftOut = (await readSiteInclusion(coordinator, trialId))!.filter((x) => !x.included);
    expect(report.snapshot.coverage).toEqual({
      inResults: TRIAL.siteIndexes.length - 1,
      enrolled: TRIAL.siteIndexes.length,
      notIncluded: [{ name: leftOut[0]!.siteName, reason: "its data were not checked and accepted in time for this version" }],
    });
    const text = await pdfText(await renderTrialReport(report.snapshot));
    expect(text).toContain(`Results from ${TRIAL.siteIndexes.length - 1} of ${TRIAL.siteIndexes.length} sites. Not included: ${leftOut[0]!.siteName}`);
  }, 60_000);

  it("lists exactly the plots and sites left out of each trait, with plot code, site and public reason, and never the private note", async () => {
    const report = await getPublicReport(TRIAL.code);
    if (report?.kind !== "published") throw new Error("expected published");
    const byTrait = Object.fromEntries(report.snapshot.results.map((r) => [r.trait, r.result.exclusions]));
    // One plot's exclusion for one trait is listed under that trait only, with its plot code.
    expect(byTrait.marketable_yield).toEqual([{ siteName: excludedPlot.site, plotCode: excludedPlot.code, traitName: "Marketable yield", category: "plot_damaged", reason: "plot damaged (animals, hail, flooding)" }]);
    expect(byTrait.bolting).toEqual([{ siteName: excludedSite, plotCode: null, traitName: "Bolting at harvest", category: "not_sown", reason: "not sown, or sown late" }]);
    for (const [trait, list] of Object.entries(byTrait)) if (trait !== "marketable_yield" && trait !== "bolting") expect([trait, list]).toEqual([trait, []]);

    const text = await pdfText(await renderTrialReport(report.snapshot));
    expect(text).toContain(`• Marketable yield: plot ${excludedPlot.code} at ${excludedPlot.site}, reason: plot damaged (animals, hail, flooding).`);
    expect(text).toContain(`• Bolting at harvest: all plots at ${excludedSite}, reason: not sown, or sown late.`);
    expect(text.match(new RegExp(`plot ${excludedPlot.code} at`, "g"))?.length).toBe(1);

    // The notes stay in the portal: not in the stored snapshot, the public shape, the PDF or the downloads.
    const [stored] = await db.select({ snapshot: s.publishedReports.snapshot }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trialId)).orderBy(desc(s.publishedReports.version)).limit(1);
    const xlsx = await publishedXlsx(report.snapshot);
    const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-xlsx-"));
    await fs.writeFile(path.join(dir, "data.xlsx"), xlsx);
    const unzipped = execFileSync("unzip", ["-p", path.join(dir, "data.xlsx")]).toString();
    for (const [where, body] of [["stored snapshot", stored!.snapshot], ["public shape", JSON.stringify(report.snapshot)], ["PDF", text], ["CSV", publishedCsv(report.snapshot)], ["xlsx", unzipped]] as const) {
      for (const note of [PRIVATE_NOTE, SITE_NOTE]) expect([where, body.includes(note.slice(9))]).toEqual([where, false]);
    }
    // The workbook lists what each trait leaves out, with the public reason.
    expect(unzipped).toContain("plot damaged (animals, hail, flooding)");
  }, 60_000);

  it("the review queue keeps the site left out of a published trial, marked as such, and drops the trial's accepted sites", async () => {
    const queue = (await listReviewQueue(coordinator)).filter((r) => r.trialId === trialId);
    const leftOut = (await readSiteInclusion(coordinator, trialId))!.filter((x) => !x.included);
    expect(queue.map((r) => [r.siteName, r.status, r.leftOutOfPublished])).toEqual(leftOut.map((x) => [x.siteName, "submitted", true]));
  });

  it("lists published trials, varieties and sites publicly without contact details", async () => {
    const index = await listPublicTrials({ q: "spinach" });
    expect(index.trials.map((t) => t.code)).toContain(TRIAL.code);
    expect((await listPublicTrials({ q: "no-such-variety-anywhere" })).trials).toEqual([]);
    const report = await getPublicReport(TRIAL.code);
    if (report?.kind !== "published") throw new Error("expected published");
    const variety = await getPublicVariety(report.snapshot.entries[0]!.varietyId);
    expect(variety?.trials.map((t) => t.code)).toEqual([TRIAL.code]);
    const named = report.snapshot.sites.find((x) => x.id !== null)!;
    const site = await getPublicSite(named.id!);
    expect(site?.site.name).toBe(named.name);
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

  it("tells only the growers of included sites that their site's results are out, with every version it publishes", async () => {
    const cooperators = (await cooperatorsOfTrial(true)).map((c) => c.email).sort();
    const leftOutGrowers = (await cooperatorsOfTrial(false)).map((c) => c.email).filter((e) => !cooperators.includes(e)).sort();
    expect(cooperators.length).toBeGreaterThan(0);
    expect(leftOutGrowers.length).toBeGreaterThan(0);
    const queued = await queuedSince(mailMark);
    const notices = queued.filter((m) => m.subject === `Results published: ${TRIAL.title}`);
    expect(notices.filter((m) => !/version 2/.test(m.text)).map((m) => m.to).sort()).toEqual(cooperators);
    expect(notices.filter((m) => /version 2/.test(m.text)).map((m) => m.to).sort()).toEqual(cooperators);
    for (const m of notices) expect(m.text).toContain("which your site helped grow");
    // The growers of the site left out hear only that this version does not include their site.
    const without = queued.filter((m) => m.subject === `Results published without your site: ${TRIAL.title}`);
    expect(without.map((m) => m.to).sort()).toEqual([...leftOutGrowers, ...leftOutGrowers].sort());
    for (const m of without) {
      expect(m.text).toContain("They do not include your site");
      expect(m.text).not.toContain("which your site helped grow");
    }
    for (const m of notices) expect(m.text).toContain(`/results/${TRIAL.code}`);
  });

  it("a publication refused under the trial's lock stores no version, leaves the status and queues no notice", async () => {
    const [before] = await db.select({ status: s.trials.status }).from(s.trials).where(eq(s.trials.id, trialId));
    const [last] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
    const versionsBefore = await db.select({ n: count() }).from(s.publishedReports).where(eq(s.publishedReports.trialId, trialId));
    await db.update(s.trials).set({ status: "archived" }).where(eq(s.trials.id, trialId));
    try {
      await expect(publishResults(coordinator, { trialId, traitId: null, settings: SETTINGS, changeNote: "Tried on an archived trial.", confirmedLeftOut: await leftOutNow() })).rejects.toThrow(/archived trial cannot be published/);
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
    await expect(buildSnapshot(grower, { trialId, traitId: null, settings: SETTINGS, version: 1, changeNote: null, publishedAt: new Date(), siteInclusion: [] })).rejects.toThrow(/not in your programs/);
    const [other] = await db.insert(s.users).values({ email: `other-coord-${Date.now()}@example.org`, name: "Other", role: "coordinator" }).$returningId();
    const outsider: Viewer = { id: other!.id, email: "o@example.org", name: "Other", role: "coordinator" };
    await expect(withdrawResults(outsider, { trialId, reason: "not my trial at all" })).rejects.toThrow(/not in your programs/);
    // Refused before anything is built, even though the trial has versions (no change-note hint about them).
    await expect(publishResults(outsider, { trialId, traitId: null, settings: SETTINGS, changeNote: null, confirmedLeftOut: [] })).rejects.toThrow(/not in your programs/);
    await expect(publishResults(grower, { trialId, traitId: null, settings: SETTINGS, changeNote: null, confirmedLeftOut: [] })).rejects.toThrow(/not in your programs/);
  });
});
