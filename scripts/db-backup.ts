// Consistent backups of Seedplot's database with mariadb-dump.
//   npm run db:backup [-- FILE]     writes FILE (default backups/seedplot-<timestamp>.sql.gz)
//   npm run db:restore -- FILE      loads FILE into the database (it replaces the tables in the dump)
// DATABASE_URL chooses the database (scripts/up.sh and .env.local set it).
import { spawn } from "node:child_process";
import { createReadStream, createWriteStream, promises as fs } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { fileURLToPath } from "node:url";
import { createGunzip, createGzip } from "node:zlib";

function connectionArgs(url: string) {
  const u = new URL(url);
  const database = decodeURIComponent(u.pathname.replace(/^\//, ""));
  if (!database) throw new Error("DATABASE_URL names no database.");
  return {
    database,
    args: ["--no-defaults", `--host=${u.hostname}`, `--port=${u.port || "3306"}`, `--user=${decodeURIComponent(u.username)}`],
    // The password goes through the environment, never the process list.
    env: { ...process.env, MYSQL_PWD: decodeURIComponent(u.password) },
  };
}

function waitForExit(child: ReturnType<typeof spawn>, name: string, stderr: string[]) {
  return new Promise<void>((resolve, reject) => {
    child.on("error", (e) => reject(new Error(`${name} could not start: ${e.message}`)));
    child.on("close", (code) => (code === 0 ? resolve() : reject(new Error(`${name} failed (${code}): ${stderr.join("").trim()}`))));
  });
}

/**
 * Dumps the database in one consistent snapshot (`--single-transaction`: InnoDB tables are read at a
 * single point in time without locking writers) to a gzip file.
 */
export async function backupDatabase(url: string, file: string): Promise<void> {
  const { database, args, env } = connectionArgs(url);
  await fs.mkdir(path.dirname(file), { recursive: true });
  const stderr: string[] = [];
  const dump = spawn("mariadb-dump", [...args, "--single-transaction", "--quick", "--routines", "--triggers", "--hex-blob", "--default-character-set=utf8mb4", database], { env });
  dump.stderr.on("data", (d) => stderr.push(String(d)));
  const exited = waitForExit(dump, "mariadb-dump", stderr);
  const temp = `${file}.partial`;
  await pipeline(dump.stdout, createGzip(), createWriteStream(temp));
  await exited;
  // Renamed only when complete, so a failed dump never leaves a file that looks like a backup.
  await fs.rename(temp, file);
}

/** Loads a backup made by backupDatabase into the database named in `url`. */
export async function restoreDatabase(url: string, file: string): Promise<void> {
  const { database, args, env } = connectionArgs(url);
  await fs.access(file);
  const stderr: string[] = [];
  const client = spawn("mariadb", [...args, "--default-character-set=utf8mb4", database], { env, stdio: ["pipe", "ignore", "pipe"] });
  client.stderr!.on("data", (d) => stderr.push(String(d)));
  const exited = waitForExit(client, "mariadb", stderr);
  const source = createReadStream(file);
  await pipeline(file.endsWith(".gz") ? source.pipe(createGunzip()) : source, client.stdin!);
  await exited;
}

async function main() {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("Set DATABASE_URL (scripts/up.sh writes it to .env.local).");
  const [command, file] = process.argv.slice(2);
  if (command === "backup") {
    const target = file ?? path.join("backups", `seedplot-${new Date().toISOString().replace(/[:.]/g, "-")}.sql.gz`);
    await backupDatabase(url, target);
    console.log(`[seedplot] backup written to ${target}`);
  } else if (command === "restore" && file) {
    await restoreDatabase(url, file);
    console.log(`[seedplot] restored ${file}`);
  } else {
    throw new Error("Usage: db-backup.ts backup [FILE] | restore FILE");
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === path.resolve(process.argv[1])) {
  main().catch((e) => {
    console.error(`[seedplot] ${e instanceof Error ? e.message : e}`);
    process.exit(1);
  });
}
