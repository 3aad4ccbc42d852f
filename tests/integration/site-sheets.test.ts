import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { testDatabase, unique } from "../helpers/db";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { insertCrop, insertSeedLot, insertTrait, insertVariety } from "@/db/mutations/catalogue";
import { createTrial, addTrialEntry } from "@/server/trials/design";
import { enrolTrialSite, randomiseTrialSite } from "@/server/trials/enrolment";
import { insertSite } from "@/db/mutations/sites";
import { getSiteLayout } from "@/db/queries/trials";
import { createTrialSchema } from "@/lib/validation/trials";
import { traitSchema } from "@/lib/validation/catalogue";
import { buildSiteSheetData, plotPageUrl } from "@/server/trials/sheets";
import { renderSiteSheet } from "@/reports/site-sheets";

const { db, pool } = testDatabase();
const dir = mkdtempSync(path.join(tmpdir(), "seedplot-sheets-"));
let coordinator: Viewer;
let trialId: number;
let siteId: number;
const varietyNames: string[] = [];

const pdfText = (pdf: Buffer, name: string) => {
  const file = path.join(dir, `${name}.pdf`);
  writeFileSync(file, pdf);
  return execFileSync("pdftotext", ["-layout", file, "-"]).toString();
};

beforeAll(async () => {
  const email = `${unique("coord")}@example.test`;
  const [u] = await db.insert(s.users).values({ email, name: "Coord", role: "coordinator", passwordHash: "x" }).$returningId();
  coordinator = { id: u!.id, email, name: "Coord", role: "coordinator" };
  const [program] = await db.insert(s.programs).values({ slug: unique("p"), name: unique("P") }).$returningId();
  await db.insert(s.programCoordinators).values({ programId: program!.id, userId: coordinator.id });
  const [season] = await db.insert(s.seasons).values({ programId: program!.id, name: "Spring", year: 2027 }).$returningId();
  const cropId = await insertCrop(coordinator, { name: unique("Basil"), cropGroup: "herbs" });
  const traitId = await insertTrait(coordinator, traitSchema.parse({ name: "Seedlings up", code: unique("up").replace(/-/g, "_").slice(0, 38), valueType: "count", dueDaysAfterSowing: "5, 7, 10" }));
  trialId = await createTrial(
    coordinator,
    createTrialSchema.parse({ seasonId: String(season!.id), cropId: String(cropId), code: unique("B").toUpperCase().slice(0, 30), title: "Basil emergence", design: "rcbd", blocks: "4", plotUnit: "insert", plotSize: "6", seedsPerCell: "1", [`trait_${traitId}`]: "on" }),
  );
  for (let i = 0; i < 4; i += 1) {
    const name = `Secret Basil ${i}`;
    varietyNames.push(name);
    const v = await insertVariety(coordinator, { cropId, name });
    const lot = await insertSeedLot(coordinator, { varietyId: v, source: "Seed House", lotCode: `B${i}`, treated: i === 2, treatment: i === 2 ? "Fungicide" : undefined });
    await addTrialEntry(coordinator, { trialId, varietyId: v, seedLotId: lot, isCheck: false });
  }
  siteId = await insertSite(coordinator, { name: unique("Sheet farm"), kind: "farm", region: "Valley", growingSetup: "indoor_lights" });
  await enrolTrialSite(coordinator, { trialId, siteId, sownOn: "2027-03-18" });
  await randomiseTrialSite(coordinator, { trialId, siteId, seed: 20270318 });
});

afterAll(async () => {
  await pool.end();
});

describe("site printables", () => {
  it("the tray map shows every blind code, the seed and the cautions, and never a variety name", async () => {
    const layout = (await getSiteLayout(coordinator, { trialId, siteId }))!;
    const data = await buildSiteSheetData(layout, { appUrl: "http://seedplot.test", pageSize: "LETTER", withQr: false, today: "2027-03-01" });
    const text = pdfText(await renderSiteSheet("map", data), "map");
    for (const code of new Set(layout.plots.map((p) => p.blindCode))) expect(text).toContain(code);
    expect(text).toContain("20270318");
    expect(text).toContain("Flat 2");
    expect(text).toMatch(/Treated seed/);
    expect(text).toMatch(/GFCI/);
    for (const name of varietyNames) expect(text).not.toContain(name);
    execFileSync("pdftoppm", ["-png", "-r", "60", "-f", "1", "-l", "1", path.join(dir, "map.pdf"), path.join(dir, "map")]);
  });

  it("labels carry plot id, code, block and a QR code of the plot page; the data sheet lists due dates", async () => {
    const layout = (await getSiteLayout(coordinator, { trialId, siteId }))!;
    const labels = await buildSiteSheetData(layout, { appUrl: "http://seedplot.test", pageSize: "A4", withQr: true });
    expect(Object.keys(labels.qrCodes!)).toHaveLength(16);
    expect(labels.qrCodes![layout.plots[0]!.id]).toMatch(/^data:image\/png;base64,/);
    expect(plotPageUrl("http://seedplot.test/", 12)).toBe("http://seedplot.test/portal/plots/12");
    const labelText = pdfText(await renderSiteSheet("labels", labels), "labels");
    for (const p of layout.plots) expect(labelText).toContain(p.plotCode);
    const sheet = await buildSiteSheetData(layout, { appUrl: "http://seedplot.test", pageSize: "LETTER", withQr: false });
    const sheetText = pdfText(await renderSiteSheet("sheet", sheet), "sheet");
    expect(sheetText).toContain("Day 5");
    expect(sheetText).toMatch(/Mar 23, 2027/);
    for (const p of layout.plots) expect(sheetText).toContain(p.plotCode);
  });

  it("the packing list gives each code its lot, treated or not, and the seeds to count with spares", async () => {
    const layout = (await getSiteLayout(coordinator, { trialId, siteId }))!;
    const data = await buildSiteSheetData(layout, { appUrl: "http://seedplot.test", pageSize: "A4", withQr: false });
    const text = pdfText(await renderSiteSheet("packing", data), "packing");
    // 4 plots x one six-cell insert x 1 seed per cell = 24 seeds per code; 20% spare rounds up to 5: 29 to count.
    const codes = [...new Set(layout.plots.map((p) => p.blindCode))].sort();
    for (const code of codes) {
      const lot = layout.entries.find((e) => e.blindCode === code)!;
      const line = text.split("\n").find((l) => l.includes(` ${code} `))!;
      expect(line).toBeDefined();
      expect(line).toMatch(lot.treated ? /TREATED/ : /untreated/);
      expect(line).toMatch(/Seed House · B\d/);
      expect(line.trim().split(/\s+/).slice(-4)).toEqual(["4", "6", "5", "29"]);
    }
    expect(layout.entries.filter((e) => e.treated)).toHaveLength(1);
    expect(text).toContain(`4 packets, ${4 * 29} seeds in all`);
    for (const name of varietyNames) expect(text).not.toContain(name);
  });

  it("maps and labels mark the treated code and the caution names it, for growers too, without the seed lots", async () => {
    const layout = (await getSiteLayout(coordinator, { trialId, siteId }))!;
    const treated = layout.entries.find((e) => e.treated)!.blindCode;
    const data = await buildSiteSheetData(layout, { appUrl: "http://seedplot.test", pageSize: "LETTER", withQr: false });
    const map = pdfText(await renderSiteSheet("map", data), "map-treated");
    expect(map).toContain(`The packet coded ${treated} holds treated seed`);
    expect(map).toMatch(/not for food or feed/);
    expect((map.match(/TREATED/g) ?? []).length).toBeGreaterThanOrEqual(4);
    const labels = pdfText(await renderSiteSheet("labels", data), "labels-treated");
    expect((labels.match(/TREATED SEED/g) ?? []).length).toBe(layout.plots.filter((p) => p.blindCode === treated).length);

    const email = `${unique("grower")}@example.test`;
    const [g] = await db.insert(s.users).values({ email, name: "Grower", role: "cooperator", passwordHash: "x" }).$returningId();
    await db.insert(s.siteCooperators).values({ siteId, userId: g!.id });
    const growerLayout = (await getSiteLayout({ id: g!.id, email, name: "Grower", role: "cooperator" }, { trialId, siteId }))!;
    expect(growerLayout.entries.map((e) => e.lot)).toEqual([null, null, null, null]);
    expect(growerLayout.entries.find((e) => e.treated)!.blindCode).toBe(treated);
  });

  it("writes its files for a look", () => {
    console.log(`PDFs and PNG in ${dir}`);
  });
});
