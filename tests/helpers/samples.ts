import type { Pool } from "mysql2/promise";
import type { SampleIds } from "../e2e/access-matrix";

async function one(pool: Pool, sql: string, params: unknown[]): Promise<number> {
  const [rows] = (await pool.query(sql, params)) as unknown as [{ id: number }[]];
  if (!rows[0]) throw new Error(`no demo row for: ${sql} ${JSON.stringify(params)}; reseed the e2e database`);
  return Number(rows[0].id);
}

/** Demo ids in the e2e database that the access and hostile-input tests aim at. */
export async function loadSampleIds(pool: Pool): Promise<SampleIds> {
  const trial = (code: string) => one(pool, "SELECT id FROM trials WHERE code = ?", [code]);
  const site = (name: string) => one(pool, "SELECT id FROM sites WHERE name = ?", [name]);
  const [kal, spn, siteA, siteB] = await Promise.all([trial("TV27-KAL"), trial("TV26-SPN"), site("Willow Bend Farm"), site("Cedar Hollow Market Garden")]);
  const plot = (siteId: number) =>
    one(pool, "SELECT p.id FROM plots p JOIN enrolments e ON e.id = p.enrolment_id WHERE e.trial_id = ? AND e.site_id = ? ORDER BY p.block, p.position LIMIT 1", [kal, siteId]);
  const unpublishedSite = await one(
    pool,
    "SELECT e.site_id AS id FROM enrolments e JOIN trials t ON t.id = e.trial_id GROUP BY e.site_id HAVING SUM(t.code <> 'TV27-KAL') = 0 ORDER BY e.site_id LIMIT 1",
    [],
  );
  const unpublishedVariety = await one(
    pool,
    "SELECT te.variety_id AS id FROM trial_entries te JOIN trials t ON t.id = te.trial_id GROUP BY te.variety_id HAVING SUM(t.code <> 'TV27-KAL') = 0 ORDER BY te.variety_id LIMIT 1",
    [],
  );
  const variety = await one(pool, "SELECT variety_id AS id FROM trial_entries WHERE trial_id = ? ORDER BY id LIMIT 1", [kal]);
  const otherTrial = await trial("JF27-LET");
  const otherVariety = await one(pool, "SELECT variety_id AS id FROM trial_entries WHERE trial_id = ? ORDER BY id LIMIT 1", [otherTrial]);
  const kalCrop = await one(pool, "SELECT crop_id AS id FROM trials WHERE id = ?", [kal]);
  return { kal, kalCrop, spn, siteA, siteB, unpublishedSite, unpublishedVariety, variety, otherTrial, otherVariety, plotA: await plot(siteA), plotB: await plot(siteB) };
}
