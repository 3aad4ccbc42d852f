// Times a 10,000-row upload: tsx --conditions react-server scripts/bench-upload.ts (DATABASE_URL = a test database).
// Builds a throwaway trial with 10,000 plots, then reports how long reading, checking and saving take.
import { createDatabase } from "../db/client";
import { bigSiteCsv, insertBigSite } from "../tests/helpers/big-site";
import { addDays, todayIso } from "../lib/domain/schedule";

const url = process.env.DATABASE_URL ?? "";
if (!/seedplot_test|seedplot_e2e|bench/.test(url)) {
  console.error("Point DATABASE_URL at a test database (seedplot_test); the benchmark adds a 10,000-plot trial.");
  process.exit(1);
}
const rows = Number(process.argv[2] ?? 10_000);
const { db, pool } = createDatabase(url, 4);
const { inspectUpload } = await import("../lib/domain/spreadsheets/safety");
const { readUpload } = await import("../lib/domain/spreadsheets/read");
const { listTrialColumns } = await import("../server/observations/sheet");
const { planSiteObservations, saveSiteObservations } = await import("../server/observations/save");
const { db: appDb, pool: appPool } = await import("../db/index");

const site = await insertBigSite(db, { plots: rows, tag: `bench${Date.now().toString(36)}`, sownOn: addDays(todayIso(), -30) });
const bytes = bigSiteCsv(site);
const time = async <T>(label: string, fn: () => Promise<T>) => {
  const t0 = performance.now();
  const out = await fn();
  const ms = performance.now() - t0;
  console.log(`${label.padEnd(10)} ${ms.toFixed(0).padStart(6)} ms`);
  console.log(["RESULT", `${rows}-row upload, ${label}`, ms.toFixed(0), "ms", "-", "-", "-"].join("\t"));
  return out;
};
console.log(`${rows} rows, ${(bytes.length / 1024).toFixed(0)} KB CSV, ${rows * 3} values`);
const columns = await listTrialColumns(appDb, site.trialId);
const read = await time("parse", async () => readUpload(bytes, inspectUpload(bytes, "bench.csv"), { columns, plotCodes: site.plotCodes }));
const cells = read.rows.flatMap((r) => Object.entries(r.values).map(([key, raw]) => ({ plotCode: r.plotCode, key, raw, row: r.row })));
const plan = await time("validate", () => planSiteObservations(appDb, site.viewer, { trialId: site.trialId, siteId: site.siteId, cells }));
if (plan.problems.length) throw new Error(`unexpected problems: ${plan.problems[0]!.message}`);
const saved = await time("commit", () => saveSiteObservations(site.viewer, { trialId: site.trialId, siteId: site.siteId, cells, source: "upload" }));
console.log(`saved ${saved.saved} values`);
await pool.end();
await appPool.end();
