import { inArray } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Database } from "@/db/client";
import type { Viewer } from "@/lib/domain/viewer";

/**
 * A throwaway trial with one site of `plots` plots (10 entries, plots/10 blocks) recording seeds sown,
 * marketable yield and quality, and its own cooperator: for large-upload tests and the upload benchmark.
 */
export async function insertBigSite(db: Database, p: { plots: number; tag: string; sownOn: string }) {
  const tag = p.tag.replace(/[^A-Za-z0-9]/g, "").slice(-12).toUpperCase();
  const email = `big-${tag.toLowerCase()}@example.test`;
  const [u] = await db.insert(s.users).values({ email, name: `Grower ${tag}`, role: "cooperator", passwordHash: "x" }).$returningId();
  const viewer: Viewer = { id: u!.id, email, name: `Grower ${tag}`, role: "cooperator" };
  const [program] = await db.insert(s.programs).values({ slug: `big-${tag.toLowerCase()}`, name: `Big ${tag}` }).$returningId();
  const [season] = await db.insert(s.seasons).values({ programId: program!.id, name: "Big season", year: 2026 }).$returningId();
  const [crop] = await db.insert(s.crops).values({ name: `Big crop ${tag}`, cropGroup: "leafy_greens" }).$returningId();
  const [site] = await db.insert(s.sites).values({ programId: program!.id, name: `Big site ${tag}`, kind: "farm", region: "Valley", growingSetup: "field" }).$returningId();
  const [trial] = await db
    .insert(s.trials)
    .values({ programId: program!.id, seasonId: season!.id, cropId: crop!.id, code: `BIG-${tag}`, title: `Big trial ${tag}`, blocks: Math.ceil(p.plots / 10), plotUnit: "bed_row", plotSize: 20, status: "collecting" })
    .$returningId();
  const traitRows = await db.select({ id: s.traits.id, code: s.traits.code }).from(s.traits).where(inArray(s.traits.code, ["seeds_sown", "marketable_yield", "quality"]));
  await db.insert(s.trialTraits).values(traitRows.map((t, i) => ({ trialId: trial!.id, traitId: t.id, sortOrder: i })));
  const entryIds: number[] = [];
  for (let i = 0; i < 10; i += 1) {
    const [v] = await db.insert(s.varieties).values({ programId: program!.id, cropId: crop!.id, name: `Variety ${i}` }).$returningId();
    const [e] = await db.insert(s.trialEntries).values({ trialId: trial!.id, varietyId: v!.id, blindCode: `E${i}X`, entryNumber: i + 1 }).$returningId();
    entryIds.push(e!.id);
  }
  const [enrolment] = await db.insert(s.enrolments).values({ trialId: trial!.id, siteId: site!.id, cooperatorId: viewer.id, sownOn: p.sownOn, randomisedAt: new Date() }).$returningId();
  const rows = Array.from({ length: p.plots }, (_, i) => ({
    enrolmentId: enrolment!.id,
    trialId: trial!.id,
    siteId: site!.id,
    entryId: entryIds[i % 10]!,
    plotCode: `P${String(i + 1).padStart(5, "0")}`,
    block: Math.floor(i / 10) + 1,
    position: (i % 10) + 1,
  }));
  for (let i = 0; i < rows.length; i += 1000) await db.insert(s.plots).values(rows.slice(i, i + 1000));
  return { viewer, trialId: trial!.id, siteId: site!.id, enrolmentId: enrolment!.id, plotCodes: rows.map((r) => r.plotCode), blindCodes: rows.map((_, i) => `E${i % 10}X`) };
}

/** A CSV for the big site: every plot with seeds sown, a yield and a quality score. */
export function bigSiteCsv(site: Awaited<ReturnType<typeof insertBigSite>>, edit?: (row: number, cells: string[]) => void) {
  const lines = ["Plot,Block,Code,Seeds sown [seeds],Marketable yield [g per plot],Overall quality [1-9]"];
  site.plotCodes.forEach((code, i) => {
    const cells = [code, String(Math.floor(i / 10) + 1), site.blindCodes[i]!, "20", String(1000 + (i % 250)), String(1 + (i % 9))];
    edit?.(i + 2, cells);
    lines.push(cells.join(","));
  });
  return new TextEncoder().encode(lines.join("\n"));
}
