import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDatabase } from "@/db/client";
import { DEMO_PASSWORDS, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { seededRandom } from "@/lib/domain/design/random";
import type { SampleIds } from "./access-matrix";
import { httpSession, request, type HttpSession } from "../helpers/http";
import { loadSampleIds } from "../helpers/samples";
import { UPLOAD_CORPUS } from "../helpers/bad-uploads";
import { parseCsv } from "@/lib/domain/spreadsheets/csv";

// Generated malformed requests against the JSON APIs and the upload endpoints. Every answer must be a 4xx
// with a readable message, and the database must be exactly as before.

const SEED = 20261201;
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let ids: SampleIds;
let grower: HttpSession;
let coordinator: HttpSession;
let exportCsv: string;

beforeAll(async () => {
  ids = await loadSampleIds(e2e.pool);
  grower = await httpSession(DEMO_SITES[1].grower.email, DEMO_PASSWORDS.cooperator);
  coordinator = await httpSession(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator);
  exportCsv = await (await request(`/api/record/${ids.kal}/${ids.siteB}/export`, grower)).text();
});
afterAll(async () => {
  await e2e.pool.end();
});

// Tables the server writes in the background are compared by row count and last id (both are append-only,
// so any new row still shows), leaving out the background rows: the outbox worker marks queued mail as sent,
// and the reminder timer (server/jobs.ts) first fires a minute after start, which can land inside this test.
const BACKGROUND_ROWS: Record<string, string> = {
  audit_log: "action <> 'reminder.sent'",
  mail_outbox: "subject NOT LIKE 'Overdue counts at %' AND subject NOT LIKE 'Counts due tomorrow at %'",
};
// The timers' own bookkeeping: which instance runs reminders and cleanup this period (server/jobs.ts).
const BACKGROUND_TABLES = new Set(["job_leases"]);

/** Row count and checksum of every table, so any write at all shows up. */
async function fingerprint(): Promise<Record<string, string>> {
  const [tables] = (await e2e.pool.query("SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name")) as unknown as [{ name: string }[]];
  const out: Record<string, string> = {};
  for (const { name } of tables) {
    if (BACKGROUND_TABLES.has(name)) continue;
    if (BACKGROUND_ROWS[name]) {
      const [[own]] = (await e2e.pool.query(`SELECT COUNT(*) AS n, COALESCE(MAX(id), 0) AS top FROM \`${name}\` WHERE ${BACKGROUND_ROWS[name]}`)) as unknown as [[{ n: number; top: number }]];
      out[name] = `rows ${own.n}, last id ${own.top}`;
      continue;
    }
    const [[count]] = (await e2e.pool.query(`SELECT COUNT(*) AS n, COALESCE(MAX(id), 0) AS top FROM \`${name}\``).catch(() => e2e.pool.query(`SELECT COUNT(*) AS n, 0 AS top FROM \`${name}\``))) as unknown as [[{ n: number; top: number }]];
    const [[sum]] = (await e2e.pool.query(`CHECKSUM TABLE \`${name}\``)) as unknown as [[{ Checksum: number | null }]];
    out[name] = `rows ${count.n}, last id ${count.top}, checksum ${sum.Checksum}`;
  }
  return out;
}

const INJECTIONS = ["'; DROP TABLE users; --", "\" OR 1=1 --", "<script>alert(1)</script>", "<img src=x onerror=alert(1)>", "${7*7}", "{{7*7}}", "../../etc/passwd", "\u0000", "\ud800", "%00", "😀".repeat(50), "=HYPERLINK(\"http://x\")"];

interface Case {
  label: string;
  path: string;
  session: HttpSession;
  init: RequestInit;
}

// Lone surrogates cannot be percent-encoded by encodeURIComponent; undecodable escapes are covered in security.test.ts.
const encode = (s: string) => encodeURIComponent(s.replace(/[\ud800-\udfff]/g, "?"));

function generator(random: () => number) {
  const int = (n: number) => Math.floor(random() * n);
  const pick = <T,>(items: readonly T[]): T => items[int(items.length)]!;
  const junkString = () => {
    const kind = int(5);
    if (kind === 0) return pick(INJECTIONS);
    if (kind === 1) return "x".repeat(1 + int(3000));
    if (kind === 2) return String.fromCharCode(...Array.from({ length: 1 + int(40) }, () => int(0xd7ff)));
    if (kind === 3) return String(random() * 1e6 - 5e5);
    return "";
  };
  const junkValue = (depth = 0): unknown => {
    const kind = int(depth > 2 ? 6 : 9);
    switch (kind) {
      case 0: return null;
      case 1: return random() < 0.5;
      case 2: return pick([0, -1, 1.5, 1e308, -1e308, Number.MAX_SAFE_INTEGER + 2, 2 ** 31, 0.1]);
      case 3: return junkString();
      case 4: return pick(["1", "0x10", "1e3", " 7 ", "NaN", "Infinity"]);
      case 5: return undefined;
      case 6: return Array.from({ length: int(4) }, () => junkValue(depth + 1));
      case 7: return Object.fromEntries(Array.from({ length: int(4) }, () => [pick(["trialId", "siteId", "values", "__proto__", "constructor", "plotId", "key", "value"]), junkValue(depth + 1)]));
      default: return { __proto__: { admin: true }, toString: "x" };
    }
  };
  // A value that the seeds-sown trait (a count from 0 to 500) can never accept; a blank would clear a value, so none here.
  const badCount = () => pick(["-1", "501", "abc", "1.5", "1e999", "NaN", "12 seeds", ...INJECTIONS.filter((s) => s.trim() !== "")]);
  return { random, int, pick, junkString, junkValue, badCount };
}

/** Bodies for POST /api/observations that must all be refused. */
function observationCases(random: () => number, n: number): Case[] {
  const g = generator(random);
  const valid = () => ({ trialId: ids.kal, siteId: ids.siteB, values: [{ plotId: ids.plotB, key: "seeds_sown", value: "12" }] });
  const cases: Case[] = [];
  for (let i = 0; i < n; i++) {
    const kind = g.int(9);
    let body: string;
    let label: string;
    if (kind === 0) {
      label = "not JSON";
      body = g.pick(["", "{", "}", "[", "nul", "{'a':1}", "\u0000\u0001", g.junkString(), "{\"trialId\":"]);
    } else if (kind === 1) {
      label = "truncated JSON";
      const full = JSON.stringify(valid());
      body = full.slice(0, 1 + g.int(full.length - 2));
    } else if (kind === 2) {
      label = "JSON of the wrong shape";
      body = JSON.stringify(g.junkValue()) ?? "";
    } else if (kind === 3) {
      label = "wrong trialId or siteId";
      const b: Record<string, unknown> = valid();
      const field = g.pick(["trialId", "siteId"]);
      const wrong = g.pick([g.junkValue(), 0, -3, 99999999, "abc", 1.25, null]);
      // The route reads ids as Number() does, so junk such as " 7 " or [7] is the right id when that id
      // happens to be 7 (ids grow with each reseed); such a body is not wrong.
      const readsAs = (() => {
        try {
          return Number(wrong);
        } catch {
          return NaN;
        }
      })();
      b[field] = readsAs === b[field] ? 99999999 : wrong;
      body = JSON.stringify(b);
    } else if (kind === 4) {
      label = "malformed value item";
      const item: Record<string, unknown> = { plotId: ids.plotB, key: "seeds_sown", value: g.badCount() };
      const field = g.pick(["plotId", "key", "value", "extra"]);
      item[field] = field === "value" ? g.pick([12, true, { a: 1 }, ["1"], "9".repeat(2001)]) : field === "extra" ? g.junkValue() : g.junkValue();
      if (field === "extra") item.value = g.badCount();
      body = JSON.stringify({ ...valid(), values: [item] });
    } else if (kind === 5) {
      label = "values of the wrong size";
      body = JSON.stringify({ ...valid(), values: g.random() < 0.5 ? [] : Array.from({ length: 1001 }, () => ({ plotId: ids.plotB, key: "seeds_sown", value: "3" })) });
    } else if (kind === 6) {
      label = "one unacceptable value among good ones";
      const values = Array.from({ length: 1 + g.int(5) }, () => ({ plotId: ids.plotB, key: "seeds_sown", value: String(g.int(400)) }));
      values.splice(g.int(values.length + 1), 0, { plotId: ids.plotB, key: g.pick(["seeds_sown", "no_such_trait", g.junkString().slice(0, 80) || "k"]), value: g.badCount() });
      body = JSON.stringify({ ...valid(), values });
    } else if (kind === 7) {
      label = "another site's plot or site";
      body = JSON.stringify(g.random() < 0.5 ? { ...valid(), siteId: ids.siteA } : { ...valid(), values: [{ plotId: g.pick([ids.plotA, 99999999]), key: "seeds_sown", value: g.badCount() }] });
    } else {
      label = "deeply nested";
      let deep: unknown = "x";
      for (let d = 0; d < 200 + g.int(2000); d++) deep = [deep];
      body = JSON.stringify({ ...valid(), values: deep });
    }
    const contentType = g.pick(["application/json", "application/json", "text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", ""]);
    cases.push({
      label: `observations: ${label}`,
      path: "/api/observations",
      session: g.random() < 0.5 ? grower : coordinator,
      init: { method: "POST", body, headers: contentType ? { "Content-Type": contentType } : {} },
    });
  }
  return cases;
}

/** Malformed path and query parameters for every GET API that takes any. */
function queryCases(random: () => number, n: number): Case[] {
  const g = generator(random);
  // Never small positive integers, which could name a real row.
  const badId = () => encode(g.pick(["0", "-1", "1.5", "abc", "99999999", "1e400", "%", "null", "[]", ...INJECTIONS]));
  const badText = () => encode(g.pick(["", "x".repeat(101 + g.int(3000)), ...INJECTIONS]));
  const builders: (() => string)[] = [
    () => `/api/observations?trialId=${badId()}&siteId=${g.random() < 0.5 ? ids.siteB : badId()}`,
    () => `/api/submissions?trialId=${g.random() < 0.5 ? ids.kal : badId()}&siteId=${badId()}`,
    () => `/api/trials/${badId()}`,
    () => `/api/trials/${badId()}/sites/${badId()}/layout`,
    () => `/api/trials/${ids.spn}/analysis?${g.pick(["trait", "sites", "unaccepted", "model", "compare"])}=${badText() || "x"}`,
    () => `/api/trials/${badId()}/analysis`,
    () => `/api/trials/${ids.spn}/analysis/export?format=${badText() || "pdf"}&table=${badText() || "x"}`,
    () => `/api/photos/${badId()}`,
    () => `/api/public/v1/trials?${g.pick(["q", "crop", "season"])}=${encode("x".repeat(101 + g.int(2000)))}`,
    () => `/api/public/v1/trials/${badId()}`,
    () => `/api/public/v1/trials/TV26-LET?version=${badId()}`,
    () => `/results/${badId()}/data?format=${badText()}`,
    () => `/api/record/${badId()}/${ids.siteB}/export`,
    () => `/api/record/${ids.kal}/${badId()}/template`,
    () => `/portal/trials/${ids.kal}/sites/${ids.siteB}/sheets?kind=${badText() || "poster"}&size=${badText() || "A0"}`,
  ];
  return Array.from({ length: n }, (_, i) => {
    const path = builders[i % builders.length]!();
    return { label: `query: ${path.slice(0, 80)}`, path, session: g.random() < 0.5 ? grower : coordinator, init: { method: "GET" } };
  });
}

/** Files and forms for the sheet upload (always "commit") and the photo upload that must all be refused. */
function uploadCases(random: () => number, n: number): Case[] {
  const g = generator(random);
  const lines = exportCsv.trim().split(/\r?\n/);
  const header = lines[0]!;
  if (!/seeds sown/i.test(header)) throw new Error(`the site export has no seeds-sown column to spoil: ${header}`);
  const seedsColumn = header.split(",").findIndex((h) => /seeds sown/i.test(h));
  const badSheet = () => {
    const rows = lines.slice(1).map((l) => l.split(","));
    const kind = g.int(5);
    if (kind === 0) return g.junkString() + "\n" + g.junkString();
    if (kind === 1) return [g.pick(["plot,block", "", "a,b,c", header.split(",").reverse().join(",")]), ...rows.map((r) => r.join(","))].join("\n");
    // The template's own rows with one value seeds-sown can never take, and junk in other cells.
    const target = rows[g.int(rows.length)]!;
    if (seedsColumn >= 0) target[seedsColumn] = JSON.stringify(g.badCount());
    for (let k = 0; k < g.int(4); k++) {
      const r = rows[g.int(rows.length)]!;
      r[g.int(r.length)] = JSON.stringify(g.pick(INJECTIONS));
    }
    if (kind === 3) rows.push([...target]);
    return [header, ...rows.map((r) => r.join(","))].join("\n");
  };
  const zipLike = () => {
    const bytes = new Uint8Array(4 + g.int(4000));
    for (let k = 0; k < bytes.length; k++) bytes[k] = g.int(256);
    bytes.set([0x50, 0x4b, 0x03, 0x04]);
    return bytes;
  };
  const imageLike = () => {
    const bytes = new Uint8Array(8 + g.int(4000));
    for (let k = 0; k < bytes.length; k++) bytes[k] = g.int(256);
    bytes.set(g.pick([[0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a], [0xff, 0xd8, 0xff, 0xe0], [0x52, 0x49, 0x46, 0x46, 0, 0, 0, 0, 0x57, 0x45, 0x42, 0x50], [0x47, 0x49, 0x46, 0x38]]));
    return bytes;
  };
  const cases: Case[] = [];
  for (let i = 0; i < n; i++) {
    const photo = i % 3 === 2;
    const form = new FormData();
    let body: BodyInit = form;
    let headers: Record<string, string> = {};
    const kind = g.int(6);
    let label: string;
    if (photo) {
      label = ["no file", "file as text", "bad fields", "not an image", "broken image", "not multipart"][kind]!;
      form.set("trialId", String(ids.kal));
      form.set("siteId", String(ids.siteB));
      if (kind === 1) form.set("file", g.junkString());
      if (kind === 2) {
        form.set(g.pick(["trialId", "siteId", "plotId", "takenOn", "caption"]), g.pick(["abc", "-1", "2026-99-99", "x".repeat(301), ...INJECTIONS]));
        form.set("file", new Blob([imageLike()], { type: "image/png" }), "p.png");
      }
      if (kind === 3) form.set("file", new Blob([g.junkString()], { type: "image/jpeg" }), g.pick(["a.jpg", "a.png", "", "../../x.jpg"]));
      if (kind === 4) form.set("file", new Blob([imageLike()], { type: g.pick(["image/png", "image/jpeg", "application/octet-stream"]) }), "b.jpg");
      if (kind === 5) {
        body = g.junkString();
        headers = { "Content-Type": g.pick(["multipart/form-data", "multipart/form-data; boundary=", "application/json", "image/jpeg"]) };
      }
    } else {
      label = ["no file", "bad mode", "junk text", "zip-like bytes", "sheet with a bad value", "not multipart"][kind]!;
      form.set("mode", kind === 1 ? g.pick(["", "save", "COMMIT", ...INJECTIONS]) : "commit");
      if (kind === 0) form.set("file", g.junkString());
      if (kind === 1 || kind === 4) form.set("file", new Blob([badSheet()], { type: "text/csv" }), g.pick(["data.csv", "data.CSV", "data.txt", "data"]));
      if (kind === 2) form.set("file", new Blob([g.junkString()], { type: "text/csv" }), g.pick(["a.csv", "a.xlsx", "a.xls", "a"]));
      if (kind === 3) form.set("file", new Blob([zipLike()], { type: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" }), "a.xlsx");
      if (kind === 5) {
        body = g.junkString();
        headers = { "Content-Type": g.pick(["multipart/form-data; boundary=zz", "text/csv", "application/json", ""]) };
      }
    }
    const session = g.random() < 0.5 ? grower : coordinator;
    const wrongSite = g.random() < 0.1;
    const path = photo ? "/api/photos" : `/api/record/${ids.kal}/${wrongSite ? g.pick(["0", "abc", String(ids.siteA)]) : ids.siteB}/upload`;
    cases.push({ label: `${photo ? "photo" : "sheet"}: ${label}`, path, session, init: { method: "POST", body, headers } });
  }
  return cases;
}

/** The message a refusal carries: an error, a refused file, or the first problem of a refused sheet. */
function messageOf(text: string, contentType: string): string {
  if (!contentType.includes("json")) return text.trim();
  const json = JSON.parse(text) as { error?: unknown; preview?: { refused?: unknown; problems?: { message?: unknown }[] } };
  const message = json.error ?? json.preview?.refused ?? json.preview?.problems?.[0]?.message;
  return typeof message === "string" ? message : "";
}

const STACK = /\bat \S+ \(|node_modules|\/work\/|webpack|\.tsx?:\d+|ECONNREFUSED|ER_[A-Z_]+|sqlMessage/;

async function run(cases: Case[], concurrency: number) {
  const failures: string[] = [];
  const statuses = new Map<number, number>();
  let next = 0;
  await Promise.all(
    Array.from({ length: concurrency }, async () => {
      while (next < cases.length) {
        const c = cases[next++]!;
        const response = await request(c.path, c.session, c.init);
        const text = await response.text();
        statuses.set(response.status, (statuses.get(response.status) ?? 0) + 1);
        const contentType = response.headers.get("content-type") ?? "";
        let message = "";
        try {
          message = messageOf(text, contentType);
        } catch {
          failures.push(`${c.label}: ${response.status} with unreadable JSON`);
          continue;
        }
        if (response.status < 400 || response.status >= 500) failures.push(`${c.label}: status ${response.status} ${text.slice(0, 200)}`);
        else if (!message) failures.push(`${c.label}: ${response.status} without a message: ${text.slice(0, 200)}`);
        else if (STACK.test(text) && !contentType.includes("text/html")) failures.push(`${c.label}: ${response.status} leaks internals: ${text.slice(0, 300)}`);
      }
    }),
  );
  return { failures, statuses: Object.fromEntries([...statuses.entries()].sort()) };
}

describe("hostile input to the JSON APIs and uploads", () => {
  it("refuses a few thousand generated malformed requests with a 4xx and a message, and writes nothing", async () => {
    const random = seededRandom(SEED);
    const cases = [...observationCases(random, 1600), ...queryCases(random, 900), ...uploadCases(random, 600)];
    expect(cases.length).toBe(3100);
    const before = await fingerprint();
    const { failures, statuses } = await run(cases, 8);
    const after = await fingerprint();
    // Printed so the run log shows what the server answered.
    console.log(`hostile input: ${cases.length} requests, statuses ${JSON.stringify(statuses)}`);
    expect(failures.slice(0, 20), `${failures.length} bad answers`).toEqual([]);
    expect(after).toEqual(before);
  }, 120_000);
});

describe("the upload corpus through the real route", () => {
  it("every hostile or sloppy sheet gets a readable answer below 500 and a refused one writes nothing", async () => {
    const template = new Uint8Array(await (await request(`/api/record/${ids.kal}/${ids.siteB}/template`, grower)).arrayBuffer());
    const grid = parseCsv(exportCsv).filter((r) => r.some((c) => c !== ""));
    const columnOf = (key: string) => {
      const heading = { quality: "Overall quality", marketable_yield: "Marketable yield", harvest_date: "First harvest date", "emergence_count@5": "Seedlings emerged (count) day 5" }[key] ?? key;
      return grid[0]!.findIndex((h) => h.startsWith(heading)) + 1;
    };
    const ctx = { template, grid, foreignPlotCode: "ZZ-9-99", columnOf };
    const before = await fingerprint();
    const failures: string[] = [];
    for (const v of UPLOAD_CORPUS) {
      const form = new FormData();
      // Refused files are sent to be saved; the others depend on this site's values, so they are only previewed.
      const mode = v.judgement === "refused" ? "commit" : "preview";
      form.set("mode", mode);
      form.set("file", new Blob([Uint8Array.from(await v.build(ctx))]), v.name);
      const response = await request(`/api/record/${ids.kal}/${ids.siteB}/upload`, grower, { method: "POST", body: form });
      const text = await response.text();
      const contentType = response.headers.get("content-type") ?? "";
      const json = contentType.includes("json") ? (JSON.parse(text) as { ok?: boolean; refused?: string | null; preview?: { refused?: string | null } }) : null;
      const refusal = json?.refused ?? json?.preview?.refused ?? (json ? messageOf(text, contentType) : "");
      if (response.status >= 500) failures.push(`${v.name}: status ${response.status} ${text.slice(0, 200)}`);
      else if (STACK.test(text)) failures.push(`${v.name}: leaks internals: ${text.slice(0, 300)}`);
      else if (mode === "commit" && (response.status < 400 || !refusal)) failures.push(`${v.name}: ${response.status} without a refusal: ${text.slice(0, 200)}`);
      else if (mode === "preview" && (response.status !== 200 || json?.ok !== (v.judgement === "accepted"))) failures.push(`${v.name}: preview ${response.status} ${text.slice(0, 200)}`);
    }
    expect(failures).toEqual([]);
    expect(await fingerprint()).toEqual(before);
  }, 120_000);
});
