// How long "Reset your password" takes to answer for an e-mail with an account and for one without,
// against a running `next start` (it starts nothing itself):
//   npm run bench:forgot                                   # the demo server from scripts/up.sh on :3000
//   FORGOT_BASE_URL=http://127.0.0.1:3400 DATABASE_URL=mysql://... npm run bench:forgot
// DATABASE_URL must be the database that server uses: the run adds throwaway accounts (forgot-bench-*),
// removed at the end with their links, mail and limit entries. Requests post the form as a browser without
// JavaScript does, alternating the two kinds, each from a loopback address of its own so the per-address
// limit never answers instead. FORGOT_ROUNDS sets the pairs (default 30, at most 3 per account and hour).
import http from "node:http";
import { inArray, like } from "drizzle-orm";
import { createDatabase } from "../db/client";
import * as s from "../db/schema";

const BASE = new URL(process.env.FORGOT_BASE_URL ?? "http://127.0.0.1:3000");
const url = process.env.DATABASE_URL ?? "";
const ROUNDS = Number(process.env.FORGOT_ROUNDS ?? 30);
if (!url) {
  console.error("Set DATABASE_URL to the database the server at FORGOT_BASE_URL uses (npm run bench:forgot reads .env.local).");
  process.exit(1);
}
const { db, pool } = createDatabase(url, 2);
const { hashPassword } = await import("../server/auth/password");
const run = Date.now().toString(36);
const PREFIX = "forgot-bench-";

function send(path: string, localAddress: string, init: { method?: string; headers?: Record<string, string>; body?: Buffer } = {}) {
  return new Promise<{ status: number; text: string }>((resolve, reject) => {
    const req = http.request(
      { host: BASE.hostname, port: BASE.port, path, method: init.method ?? "GET", localAddress, headers: { Host: BASE.host, ...init.headers } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (c: Buffer) => chunks.push(c));
        res.on("end", () => resolve({ status: res.statusCode ?? 0, text: Buffer.concat(chunks).toString("utf8") }));
      },
    );
    req.on("error", reject);
    req.end(init.body);
  });
}

let addressCounter = 0;
const nextAddress = () => {
  addressCounter += 1;
  return `127.77.${Math.floor(addressCounter / 250)}.${(addressCounter % 250) + 1}`;
};

// The form's hidden fields name the server action, as in the page a browser gets.
const page = await send("/forgot-password", nextAddress());
const hidden = [...page.text.matchAll(/<input type="hidden" name="(\$ACTION[^"]*)"(?: value="([^"]*)")?\/>/g)].map(
  ([, name, value]) => [name!, (value ?? "").replace(/&quot;/g, '"').replace(/&amp;/g, "&")] as const,
);
if (hidden.length === 0) throw new Error("No form action found on /forgot-password");

async function ask(email: string): Promise<number> {
  const form = new FormData();
  for (const [name, value] of hidden) form.set(name, value);
  form.set("email", email);
  const request = new Request("http://x/", { method: "POST", body: form });
  const body = Buffer.from(await request.arrayBuffer());
  const started = performance.now();
  const answer = await send("/forgot-password", nextAddress(), { method: "POST", headers: { "Content-Type": request.headers.get("content-type")! }, body });
  const ms = performance.now() - started;
  if (answer.status !== 200 || !answer.text.includes("If that e-mail belongs to a Seedplot account")) throw new Error(`Unexpected answer ${answer.status}`);
  return ms;
}

async function cleanUp() {
  const accounts = await db.select({ id: s.users.id }).from(s.users).where(like(s.users.email, `${PREFIX}%`));
  if (accounts.length) await db.delete(s.users).where(inArray(s.users.id, accounts.map((a) => a.id)));
  await db.delete(s.mailOutbox).where(like(s.mailOutbox.toAddress, `${PREFIX}%`));
  await db.delete(s.signInAttempts).where(like(s.signInAttempts.throttleKey, `rate:reset-to:${PREFIX}%`));
  await db.delete(s.signInAttempts).where(like(s.signInAttempts.throttleKey, "rate:reset-from:127.77.%"));
}

await cleanUp();
const hash = await hashPassword("forgot-bench-password");
const known = Array.from({ length: ROUNDS }, (_, i) => `${PREFIX}${run}-${i}@example.org`);
await db.insert(s.users).values(known.map((email) => ({ email, name: "Forgot Bench", role: "cooperator" as const, passwordHash: hash })));
try {
  // Warm-up: the first requests compile and connect.
  await ask(`${PREFIX}warm-${run}@example.org`);
  await ask(known[0]!.replace("-0@", "-warm@"));
  const times = { account: [] as number[], none: [] as number[] };
  for (let i = 0; i < ROUNDS; i += 1) {
    times.account.push(await ask(known[i]!));
    times.none.push(await ask(`${PREFIX}nobody-${run}-${i}@example.org`));
  }
  const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)]!;
  const p90 = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length * 0.9)]!;
  for (const [label, v] of [["e-mail with an account", times.account], ["e-mail without one", times.none]] as const) {
    console.log(`${label.padEnd(24)} median ${median(v).toFixed(1)} ms  p90 ${p90(v).toFixed(1)} ms  (${v.length} requests)`);
  }
  // Let the links go out before the accounts are removed.
  await new Promise((r) => setTimeout(r, 2000));
} finally {
  await cleanUp();
  await pool.end();
}
