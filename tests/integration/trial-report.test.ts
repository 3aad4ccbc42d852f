import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { and, desc, eq, gt, like } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { PublicSnapshot } from "@/lib/domain/publish/public-shape";
import { ANOVA_SOURCE_LABELS } from "@/lib/domain/vocabulary/labels";
import { DEMO_STAFF } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { leftOutSiteIds } from "@/lib/domain/publish/site-inclusion";

// The published report as a reader gets it: the lettuce demo is published here, its PDF fetched from the
// public address and read back with poppler's pdftotext, page by page.

const { GET: publicReport } = await import("@/app/(public)/results/[code]/report/route");
const { publishResults, readSiteInclusion } = await import("@/server/publish/publish");
const { getPublicReport } = await import("@/server/publish/public-snapshots");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const CODE = "TV26-LET";
let coordinator: Viewer;
let trial: { id: number; status: (typeof s.trials.$inferSelect)["status"] };
let published: { id: number; version: number };
let snapshot: PublicSnapshot;
let mailMark = 0;
let file = "";
let pages: string[] = [];

const pdftotext = (...args: string[]) => execFileSync("pdftotext", [...args, file, "-"]).toString();
/** A page's text without its running footer ("TV26-LET · … · Page 3 of 11"). */
/** The page a section starts on (the contents page names every section too, so it is skipped). */
const pageOf = (title: string) => pages.find((p, i) => i > 0 && p.trimStart().startsWith(title))!;
const body = (page: string) => page.split("\n").filter((line) => !/Page \d+ of \d+/.test(line)).join("\n").trim();

beforeAll(async () => {
  const [lastMail] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = lastMail?.id ?? 0;
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  const [t] = await db.select({ id: s.trials.id, status: s.trials.status }).from(s.trials).where(eq(s.trials.code, CODE));
  trial = t!;
  // A demo that already ships this trial published needs a change note for the next version.
  const before = await getPublicReport(CODE);
  published = await publishResults(coordinator, {
    trialId: trial.id,
    traitId: null,
    settings: { siteModel: "random", separation: "lsd" },
    changeNote: before?.kind === "published" ? "Report check." : null,
    // the report is checked as published with whatever sites the demo leaves out, confirmed as the page asks
    confirmedLeftOut: leftOutSiteIds((await readSiteInclusion(coordinator, trial.id))!),
  });
  const report = await getPublicReport(CODE);
  if (report?.kind !== "published") throw new Error("expected the trial published");
  snapshot = report.snapshot;
  const res = await publicReport(new Request(`http://t/results/${CODE}/report`), { params: Promise.resolve({ code: CODE }) });
  expect(res.status).toBe(200);
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-trial-report-"));
  file = path.join(dir, "report.pdf");
  await fs.writeFile(file, Buffer.from(await res.arrayBuffer()));
  const count = Number(/Pages:\s+(\d+)/.exec(execFileSync("pdfinfo", [file]).toString())![1]);
  pages = Array.from({ length: count }, (_, i) => pdftotext("-layout", "-f", String(i + 1), "-l", String(i + 1)));
}, 120_000);

afterAll(async () => {
  await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), like(s.mailOutbox.subject, "Results published:%")));
  await db.delete(s.publishedReports).where(eq(s.publishedReports.id, published.id));
  await db.update(s.trials).set({ status: trial.status }).where(eq(s.trials.id, trial.id));
  await pool.end();
  await appPool.end();
});

describe("the published PDF report", () => {
  it("has no blank page: every page has text besides its footer, and every section starts where the contents say", () => {
    expect(pages.length).toBeGreaterThan(5);
    pages.forEach((page, i) => expect(body(page).length, `page ${i + 1} is blank`).toBeGreaterThan(40));
    const titles = ["Summary for growers", "Methods", ...snapshot.results.map((r) => r.result.trait.analysedAs), "Germination", "Site-by-site results", "Cautions and disclaimer"];
    for (const title of titles) {
      const entry = new RegExp(`^${title.replace(/[()]/g, "\\$&")}\\s+(\\d+)\\s*$`, "m").exec(pages[0]!);
      expect(entry, `contents entry for ${title}`).not.toBeNull();
      const page = Number(entry![1]);
      expect(page).toBeLessThanOrEqual(pages.length);
      expect(pages[page - 1]).toContain(title);
    }
  });

  it("prints every glyph: the chi-square line reads back as χ², with no replacement or stray glyph", () => {
    const text = pdftotext();
    expect(text).toMatch(/germination differed between entries \(χ² = \d+\.\d\d, \d+ df, p [<=] [\d.]+\)/);
    expect(text).toMatch(/F test, α = 0\.05/);
    expect(text).not.toMatch(/[\uFFFDÇ]/);
    // Every font is embedded (the charts' text included), so the report prints the same on any machine.
    const fonts = execFileSync("pdffonts", [file]).toString().trim().split("\n").slice(2);
    expect(fonts.length).toBeGreaterThan(0);
    for (const font of fonts) expect(font, font).toMatch(/^\S+\s+.*\s+yes\s+yes\s+yes\s+\d+\s+\d+$/);
  });

  it("names varieties, not blind codes, in every note and summary line once the key is revealed", () => {
    const codes = snapshot.entries.map((e) => e.blindCode);
    const bullets = pdftotext().split("\n").filter((line) => line.startsWith("•"));
    expect(bullets.length).toBeGreaterThan(10);
    for (const line of bullets) for (const code of codes) expect(line, line).not.toMatch(new RegExp(`\\b${code}\\b`));
    expect(bullets.join("\n")).toMatch(/Best combined mean \(highest\): (Velvet Oak|Copper Ruffle|Frostline Romaine|Prairie Bibb|Sundew Batavian|Tamarack Green Leaf) \(/);
  });

  it("shows % of check beside every entry mean, the difference to the check and a mark where it exceeds the LSD", () => {
    const check = snapshot.entries.find((e) => e.isCheck)!;
    for (const r of snapshot.results.filter((x) => x.result.combined)) {
      const page = pageOf(r.result.trait.analysedAs);
      expect(page, r.result.trait.analysedAs).toMatch(/% of check\s+vs check/);
      expect(page).toMatch(new RegExp(`${check.variety} \\(check\\)\\s+${check.blindCode}\\s+[\\d.,]+\\s+100\\s`));
      for (const e of snapshot.entries.filter((x) => !x.isCheck)) expect(page).toMatch(new RegExp(`${e.variety}\\s+${e.blindCode}\\s+[\\d.,]+\\s+\\d+\\s+[+−]?[\\d.,]+( \\*)?\\s`));
    }
    expect(pdftotext()).toMatch(/marked \* where it is larger than the LSD 0\.05/);
  });

  it("follows each trait's direction: the earliest variety first for a lower-is-better trait, no rank and no 'best' without a direction", () => {
    const emergence = snapshot.results.find((r) => r.result.trait.betterWhen === "lower" && r.result.trait.computation !== "none")!.result;
    const earliest = [...emergence.combined!.means].sort((a, b) => (a.lsMean ?? a.mean) - (b.lsMean ?? b.mean))[0]!;
    const page = pageOf(emergence.trait.analysedAs);
    const firstRow = page.split("\n").find((line) => /^\s+1\s+\S/.test(line))!;
    expect(firstRow).toMatch(new RegExp(`^\\s+1\\s+${earliest.varietyName}`));
    expect(page).toContain("Listed earliest first (earlier is better).");
    const harvest = snapshot.results.find((r) => r.result.trait.betterWhen === "neither")!.result;
    const harvestPage = pageOf(harvest.trait.analysedAs);
    expect(harvestPage).not.toMatch(/Rank\s+Variety/);
    expect(harvestPage).toContain("Listed earliest first (neither earlier nor later is better in itself). No rank is given.");
    expect(harvestPage).not.toMatch(/best/i);
    const sites = pageOf("Site-by-site results");
    expect(sites).toMatch(/Best here \(earliest\)/);
    expect(sites).toMatch(/Earliest here/);
  });

  it("names ANOVA rows as the analysis page and the exports do, writes values with their units, and gives a yes/no trait no CV", () => {
    const text = pdftotext("-layout");
    for (const source of ["site", "block:site", "entry", "entry:site", "residual"] as const) expect(text).toContain(ANOVA_SOURCE_LABELS[source]);
    expect(text).not.toMatch(/Entry x site|Entries\s+\d/);
    expect(text).not.toMatch(/\d (1-9|yes\/no)\b/);
    expect(text).toMatch(/on the 1-9 scale/);
    expect(text).not.toMatch(/\d\.\d g per plot/);
    const bolting = snapshot.results.find((r) => r.result.trait.valueType === "yes_no")!.result;
    const page = pageOf(bolting.trait.analysedAs);
    expect(page).not.toMatch(/\bCV\b/);
    expect(page).toMatch(/Grand mean \d+% yes/);
    expect(text).not.toMatch(/\(seedlings\)\s*\(seedlings\)|Seedlings emerged \(final\) \(seedlings\)/);
  });
});
