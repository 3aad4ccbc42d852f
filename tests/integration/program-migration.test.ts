// The migration that gives sites, varieties and custom traits a program, run on data written before it.
// Uses seedplot_backup_dst, which the backup test empties before its own use; files run one at a time.
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { promises as fs } from "node:fs";
import os from "node:os";
import path from "node:path";
import { migrate } from "drizzle-orm/mysql2/migrator";
import { createDatabase, type Database } from "@/db/client";
import { runMigrations } from "@/db/migrate";

const MIGRATIONS = path.resolve(import.meta.dirname, "../../db/migrations");
const BEFORE = "0002_program_ownership";
const url = `${(process.env.TEST_DATABASE_URL ?? "").replace(/\/[^/]+$/, "")}/seedplot_backup_dst`;
const { db, pool } = createDatabase(url, 2);

async function dropAllTables(target: Database) {
  const [rows] = (await target.execute(sql`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE()`)) as unknown as [{ name: string }[]];
  await target.execute(sql`SET FOREIGN_KEY_CHECKS = 0`);
  for (const r of rows) await target.execute(sql.raw(`DROP TABLE \`${r.name}\``));
  await target.execute(sql`SET FOREIGN_KEY_CHECKS = 1`);
}

/** Brings the database to the schema just before program ownership, from a copy of the earlier migrations. */
async function migrateToBeforeOwnership() {
  const dir = await fs.mkdtemp(path.join(os.tmpdir(), "seedplot-migrations-"));
  const journal = JSON.parse(await fs.readFile(path.join(MIGRATIONS, "meta/_journal.json"), "utf8")) as { entries: { tag: string }[] };
  const cut = journal.entries.findIndex((e) => e.tag === BEFORE);
  expect(cut).toBeGreaterThan(0);
  journal.entries = journal.entries.slice(0, cut);
  await fs.mkdir(path.join(dir, "meta"));
  await fs.writeFile(path.join(dir, "meta/_journal.json"), JSON.stringify(journal));
  for (const e of journal.entries) await fs.copyFile(path.join(MIGRATIONS, `${e.tag}.sql`), path.join(dir, `${e.tag}.sql`));
  await migrate(db, { migrationsFolder: dir });
}

const run = (statement: string) => db.execute(sql.raw(statement));
async function column(table: string, name: string) {
  const [rows] = (await db.execute(sql.raw(`SELECT name, program_id AS programId FROM \`${table}\` ORDER BY id`))) as unknown as [{ name: string; programId: number | null }[]];
  return Object.fromEntries(rows.map((r) => [r.name, r.programId]))[name];
}

beforeEach(async () => {
  await dropAllTables(db);
  await migrateToBeforeOwnership();
}, 120_000);

afterAll(async () => {
  await dropAllTables(db);
  await pool.end();
});

describe("migration: sites, varieties and custom traits get a program", () => {
  it("gives each row the program of the first trial using it, and the first program otherwise", async () => {
    await run(`INSERT INTO programs (id, slug, name) VALUES (1, 'first', 'First'), (2, 'second', 'Second')`);
    await run(`INSERT INTO seasons (id, program_id, name, year) VALUES (1, 1, 'S1', 2026), (2, 2, 'S2', 2026)`);
    await run(`INSERT INTO crops (id, name, crop_group) VALUES (1, 'Lettuce', 'leafy_greens')`);
    await run(`INSERT INTO sites (id, name, kind, region, growing_setup) VALUES (1, 'Second only', 'farm', 'R', 'field'), (2, 'Both, first earlier', 'farm', 'R', 'field'), (3, 'Unused site', 'farm', 'R', 'field')`);
    await run(`INSERT INTO varieties (id, crop_id, name) VALUES (1, 1, 'Second variety'), (2, 1, 'Unused variety')`);
    await run(`INSERT INTO traits (id, code, name, value_type, built_in) VALUES (1, 'builtin', 'Built in', 'count', true), (2, 'second_trait', 'Second trait', 'count', false), (3, 'unused_trait', 'Unused trait', 'count', false)`);
    await run(`INSERT INTO trials (id, program_id, season_id, crop_id, code, title, blocks) VALUES (1, 1, 1, 1, 'FIRST-1', 'First trial', 3), (2, 2, 2, 1, 'SECOND-1', 'Second trial', 3)`);
    await run(`INSERT INTO enrolments (id, trial_id, site_id) VALUES (1, 2, 1), (2, 1, 2), (3, 2, 2)`);
    await run(`INSERT INTO trial_entries (trial_id, variety_id, blind_code, entry_number) VALUES (2, 1, 'A1', 1)`);
    await run(`INSERT INTO trial_traits (trial_id, trait_id) VALUES (2, 1), (2, 2)`);

    await runMigrations(url);

    expect(await column("sites", "Second only")).toBe(2);
    expect(await column("sites", "Both, first earlier")).toBe(1);
    expect(await column("sites", "Unused site")).toBe(1);
    expect(await column("varieties", "Second variety")).toBe(2);
    expect(await column("varieties", "Unused variety")).toBe(1);
    expect(await column("traits", "Built in")).toBeNull();
    expect(await column("traits", "Second trait")).toBe(2);
    expect(await column("traits", "Unused trait")).toBe(1);
    // Names are now unique within a program only.
    await run(`INSERT INTO sites (program_id, name, kind, region, growing_setup) VALUES (2, 'Unused site', 'farm', 'R', 'field')`);
    const duplicate = await run(`INSERT INTO sites (program_id, name, kind, region, growing_setup) VALUES (1, 'Unused site', 'farm', 'R', 'field')`).catch((e: { cause?: { errno?: number } }) => e.cause?.errno);
    expect(duplicate).toBe(1062);
  });

  it("creates a program to own sites written before any program existed", async () => {
    await run(`INSERT INTO sites (id, name, kind, region, growing_setup) VALUES (1, 'Lone site', 'garden', 'R', 'field')`);
    await runMigrations(url);
    const [[program]] = (await db.execute(sql`SELECT id, slug FROM programs`)) as unknown as [{ id: number; slug: string }[]];
    expect(program!.slug).toBe("default");
    expect(await column("sites", "Lone site")).toBe(program!.id);
  });
});
