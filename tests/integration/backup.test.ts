import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { createDatabase, type Database } from "@/db/client";
import { runMigrations } from "@/db/migrate";
import { emptyAllTables, seedDemo } from "@/db/seed";
import { backupDatabase, restoreDatabase } from "../../scripts/db-backup";

// Two databases only this file uses, so nothing else writes while the snapshot is compared.
const base = (process.env.TEST_DATABASE_URL ?? "").replace(/\/[^/]+$/, "");
const sourceUrl = `${base}/seedplot_backup_src`;
const targetUrl = `${base}/seedplot_backup_dst`;
const source = createDatabase(sourceUrl, 2);
const target = createDatabase(targetUrl, 2);

async function dropAllTables(db: Database) {
  const [rows] = (await db.execute(sql`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()`)) as unknown as [{ name: string }[]];
  await db.execute(sql`SET FOREIGN_KEY_CHECKS = 0`);
  for (const r of rows) await db.execute(sql.raw(`DROP TABLE \`${r.name}\``));
  await db.execute(sql`SET FOREIGN_KEY_CHECKS = 1`);
}

async function tableChecksums(db: Database) {
  const [tables] = (await db.execute(sql`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() ORDER BY table_name`)) as unknown as [{ name: string }[]];
  const result: Record<string, { checksum: string; rows: number }> = {};
  for (const t of tables) {
    const [[sum]] = (await db.execute(sql.raw(`CHECKSUM TABLE \`${t.name}\` EXTENDED`))) as unknown as [[{ Checksum: number | string }]];
    const [[count]] = (await db.execute(sql.raw(`SELECT COUNT(*) AS n FROM \`${t.name}\``))) as unknown as [[{ n: number }]];
    result[t.name] = { checksum: String(sum!.Checksum), rows: Number(count!.n) };
  }
  return result;
}

beforeAll(async () => {
  await runMigrations(sourceUrl);
  await emptyAllTables(source.db);
  await seedDemo(source.db, { today: "2026-12-01" });
  await dropAllTables(target.db);
}, 120_000);

afterAll(async () => {
  await source.pool.end();
  await target.pool.end();
});

describe("backup and restore", () => {
  it("restores a backup into an empty database with identical table checksums", async () => {
    const file = path.join(await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-backup-")), "backup.sql.gz");
    await backupDatabase(sourceUrl, file);
    expect((await fs.stat(file)).size).toBeGreaterThan(1000);

    expect(Object.keys(await tableChecksums(target.db))).toEqual([]);
    await restoreDatabase(targetUrl, file);

    const before = await tableChecksums(source.db);
    const after = await tableChecksums(target.db);
    expect(Object.keys(after)).toEqual(Object.keys(before));
    expect(before.observations!.rows).toBeGreaterThan(1000);
    expect(after).toEqual(before);
  }, 120_000);

  it("refuses to restore a file that does not exist", async () => {
    await expect(restoreDatabase(targetUrl, "/nonexistent/backup.sql.gz")).rejects.toThrow();
  });
});
