// Saves one spreadsheet through the same commit path the upload route uses, in a process of its own, so a
// test can SIGKILL it mid-transaction the way a crashed server dies.
// Usage: tsx --conditions react-server tests/helpers/commit-worker.ts JOB.json (DATABASE_URL = the target)
import { readFileSync } from "node:fs";
import type { Viewer } from "@/lib/domain/viewer";

const job = JSON.parse(readFileSync(process.argv[2]!, "utf8")) as { viewer: Viewer; trialId: number; siteId: number; csvPath: string };
const { commitUpload } = await import("@/server/spreadsheets/upload");
const { pool } = await import("@/db/index");
console.log("ready");
const result = await commitUpload(job.viewer, { trialId: job.trialId, siteId: job.siteId, bytes: new Uint8Array(readFileSync(job.csvPath)), fileName: "big.csv" });
console.log(JSON.stringify(result.ok ? { ok: true, saved: result.saved } : { ok: false }));
await pool.end();
