import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { promises as fs } from "node:fs";
import path from "node:path";
import { createDatabase } from "@/db/client";
import { DEMO_PASSWORDS, DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";
import { ACTION_MATRIX, HTTP_MATRIX, ROLES, type Outcome, type RoleKey, type SampleIds } from "./access-matrix";
import { httpSession, request, type HttpSession } from "../helpers/http";
import { loadSampleIds } from "../helpers/samples";

const ROOT = path.resolve(import.meta.dirname, "../..");
const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let ids: SampleIds;
const sessions = new Map<RoleKey, HttpSession | null>();

beforeAll(async () => {
  ids = await loadSampleIds(e2e.pool);
  sessions.set("public", null);
  // One after another: simultaneous sign-ins from one address can collide while recording the attempt.
  sessions.set("coopA", await httpSession(DEMO_SITES[0].grower.email, DEMO_PASSWORDS.cooperator));
  sessions.set("coopB", await httpSession(DEMO_SITES[1].grower.email, DEMO_PASSWORDS.cooperator));
  sessions.set("coordinator", await httpSession(DEMO_STAFF[1].email, DEMO_PASSWORDS.coordinator));
  sessions.set("otherCoordinator", await httpSession(DEMO_SECOND_PROGRAM.coordinator.email, DEMO_PASSWORDS.coordinator));
  sessions.set("otherCoop", await httpSession(DEMO_SECOND_PROGRAM.site.grower.email, DEMO_PASSWORDS.cooperator));
  sessions.set("admin", await httpSession(DEMO_STAFF[0].email, DEMO_PASSWORDS.admin));
});
afterAll(async () => {
  await e2e.pool.end();
});

async function walk(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await fs.readdir(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...(await walk(full)));
    else out.push(full);
  }
  return out;
}

/** "app/(portal)/portal/trials/[trialId]/page.tsx" -> "/portal/trials/[trialId]": route groups are not part of the address. */
function urlPattern(file: string): string {
  const segments = path.relative(path.join(ROOT, "app"), path.dirname(file)).split(path.sep).filter((s) => s !== "" && !/^\(.*\)$/.test(s));
  return "/" + segments.join("/");
}

const METHOD = /\b(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)\b/g;

/** HTTP methods a route.ts exports, as functions, constants or re-exports. */
function exportedMethods(source: string): string[] {
  const found = new Set<string>();
  for (const m of source.matchAll(/export\s+(?:async\s+)?(?:function|const|let)\s+(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)\b/g)) found.add(m[1]!);
  for (const m of source.matchAll(/export\s*\{([^}]*)\}/g)) for (const name of m[1]!.matchAll(METHOD)) found.add(name[1]!);
  return [...found].sort();
}

/** Every page and route handler method on disk, keyed as in HTTP_MATRIX. */
async function discoverHttpEntries(): Promise<string[]> {
  const keys: string[] = [];
  for (const file of await walk(path.join(ROOT, "app"))) {
    const base = path.basename(file);
    if (base === "page.tsx" || base === "page.ts") keys.push(`PAGE ${urlPattern(file)}`);
    if (base === "route.ts" || base === "route.tsx") for (const m of exportedMethods(await fs.readFile(file, "utf8"))) keys.push(`${m} ${urlPattern(file)}`);
  }
  return keys.sort();
}

type Seen = { kind: "ok" | "signin" | "forbidden" | "missing" | "soft-missing" | "unauth" | "refused" | "redirect" | "other"; status: number; to?: string };

function fromRedirect(status: number, location: string): Seen {
  const to = new URL(location.replace(/&amp;/g, "&"), "http://x").pathname;
  if (to === "/sign-in") return { kind: "signin", status, to };
  if (to === "/portal/forbidden") return { kind: "forbidden", status, to };
  return { kind: "redirect", status, to };
}

/** What the server answered, seen through streaming: a page that redirects or 404s after its shell has started still answers 200. */
async function classify(response: Response): Promise<Seen> {
  const { status } = response;
  if (status >= 300 && status < 400) return fromRedirect(status, response.headers.get("location") ?? "");
  if (status === 401) return { kind: "unauth", status };
  if (status === 403) return { kind: "forbidden", status };
  if (status === 404) return { kind: "missing", status };
  if (status === 400 || status === 409) return { kind: "refused", status };
  if (status >= 200 && status < 300) {
    if (!response.headers.get("content-type")?.includes("text/html")) {
      await response.body?.cancel();
      return { kind: "ok", status };
    }
    const html = await response.text();
    const meta = /<meta id="__next-page-redirect"[^>]*content="\d;url=([^"]+)"/.exec(html);
    if (meta) return fromRedirect(status, meta[1]!);
    // A notFound() after the shell has streamed arrives as the not-found page or as its marker in the flight data.
    if (/<h1[^>]*>Page not found<\/h1>/.test(html) || html.includes("NEXT_HTTP_ERROR_FALLBACK;404")) return { kind: "soft-missing", status };
    return { kind: "ok", status };
  }
  return { kind: "other", status };
}

function matches(expected: Outcome, seen: Seen): boolean {
  if (typeof expected === "object") return seen.kind === "redirect" && seen.to!.startsWith(expected.redirect);
  switch (expected) {
    case "deny":
      return seen.kind === "forbidden" || seen.kind === "missing" || seen.kind === "soft-missing";
    case "missing":
      return seen.kind === "missing";
    default:
      return seen.kind === expected;
  }
}

const describeOutcome = (o: Outcome) => (typeof o === "object" ? `redirect to ${o.redirect}…` : o);

describe("access matrix: every page, route handler and server action against every role", () => {
  it("has an entry for every page and route handler method found under app/", async () => {
    const onDisk = await discoverHttpEntries();
    // A sanity floor, so a broken scan cannot pass by finding nothing.
    expect(onDisk.length).toBeGreaterThan(40);
    const missing = onDisk.filter((k) => !(k in HTTP_MATRIX));
    expect(missing, `add these to tests/e2e/access-matrix.ts: ${missing.join(", ")}`).toEqual([]);
    const stale = Object.keys(HTTP_MATRIX).filter((k) => !onDisk.includes(k));
    expect(stale, `no longer on disk; remove from tests/e2e/access-matrix.ts: ${stale.join(", ")}`).toEqual([]);
    for (const [key, samples] of Object.entries(HTTP_MATRIX)) expect([key, samples.length > 0]).toEqual([key, true]);
  });

  it("answers each role as the matrix expects, other sites' objects and unpublished trials included", async () => {
    const failures: string[] = [];
    let checked = 0;
    for (const [key, samples] of Object.entries(HTTP_MATRIX)) {
      const method = key.startsWith("PAGE ") ? "GET" : key.split(" ")[0]!;
      for (const sample of samples) {
        const target = sample.path(ids);
        await Promise.all(
          ROLES.map(async (role) => {
            const response = await request(target, sessions.get(role) ?? null, { method, body: sample.body?.(ids) });
            const seen = await classify(response);
            checked++;
            if (!matches(sample.expect[role], seen)) {
              failures.push(`${key} (${sample.note}) ${method} ${target} as ${role}: expected ${describeOutcome(sample.expect[role])}, got ${seen.kind} ${seen.status}${seen.to ? ` -> ${seen.to}` : ""}`);
            }
          }),
        );
      }
    }
    expect(failures).toEqual([]);
    expect(checked).toBeGreaterThan(350);
  }, 120_000);

  it("shows each program's coordinator only their own program's rows on every list page and API", async () => {
    const first = {
      names: [...DEMO_SITES.map((x) => x.name), ...DEMO_TRIALS.map((t) => t.code), ...DEMO_TRIALS.flatMap((t) => t.entries.map((e) => e.variety))],
      contacts: DEMO_SITES.flatMap((x) => [x.grower.email, String(x.lat)]),
    };
    const second = {
      names: [DEMO_SECOND_PROGRAM.site.name, DEMO_SECOND_PROGRAM.trial.code, DEMO_SECOND_PROGRAM.trait.name, ...DEMO_SECOND_PROGRAM.trial.entries.map((e) => e.variety)],
      contacts: [DEMO_SECOND_PROGRAM.site.grower.email, String(DEMO_SECOND_PROGRAM.site.lat)],
    };
    // Lists and pick lists (the test mailbox shows captured mail and has rules of its own).
    const lists = ["/portal", "/portal/trials", "/portal/trials/new", "/portal/review", "/portal/sites", "/portal/catalogue", "/portal/catalogue/traits", "/portal/cooperators", "/api/sites", "/api/trials"];
    const problems: string[] = [];
    const check = async (role: RoleKey, own: typeof first, foreign: typeof first) => {
      const seen: string[] = [];
      for (const path of lists) {
        const body = await (await request(path, sessions.get(role)!)).text();
        seen.push(body);
        for (const text of [...foreign.names, ...foreign.contacts]) if (body.includes(text)) problems.push(`${role} sees "${text}" on ${path}`);
      }
      for (const text of [...own.names, ...own.contacts]) if (!seen.some((b) => b.includes(text))) problems.push(`${role} never sees their own "${text}"`);
    };
    await check("coordinator", first, second);
    await check("otherCoordinator", second, first);
    expect(problems).toEqual([]);
  }, 60_000);

  it("builds every exported server action with defineAction and the roles in the matrix", async () => {
    const found: Record<string, readonly string[] | "public"> = {};
    const problems: string[] = [];
    const files = [...(await walk(path.join(ROOT, "lib"))), ...(await walk(path.join(ROOT, "server"))), ...(await walk(path.join(ROOT, "app")))].filter((f) => /\.(ts|tsx)$/.test(f));
    for (const file of files) {
      const source = await fs.readFile(file, "utf8");
      if (!/^\s*["']use server["'];?/.test(source)) continue;
      const rel = path.relative(ROOT, file);
      if (path.dirname(rel) !== path.join("server", "actions")) {
        problems.push(`${rel} is a "use server" file outside server/actions`);
        continue;
      }
      // Role lists named once per file, e.g. const STAFF = ["coordinator", "admin"].
      const constants = new Map<string, string[]>();
      for (const m of source.matchAll(/const\s+(\w+)\s*=\s*\[([^\]]*)\]/g)) constants.set(m[1]!, [...m[2]!.matchAll(/"(\w+)"/g)].map((x) => x[1]!));
      for (const m of source.matchAll(/^export\s+(?:async\s+)?(?:const|let|var|function)\s+(\w+)(.*)$/gm)) {
        const key = `${path.basename(rel)}#${m[1]}`;
        const rest = m[2]!;
        if (!/^\s*=\s*defineAction\b/.test(rest)) {
          problems.push(`${key} is exported from a "use server" file but not built with defineAction`);
          continue;
        }
        const roles = /roles:\s*("public"|\[[^\]]*\]|\w+)/.exec(source.slice(m.index!))?.[1];
        if (!roles) problems.push(`${key} has no roles`);
        else if (roles === '"public"') found[key] = "public";
        else if (roles.startsWith("[")) found[key] = [...roles.matchAll(/"(\w+)"/g)].map((x) => x[1]!);
        else if (constants.has(roles)) found[key] = constants.get(roles)!;
        else problems.push(`${key} takes its roles from ${roles}, which this check cannot read`);
      }
      for (const m of source.matchAll(/^export\s*(?:default|\{)/gm)) problems.push(`${rel} has an export this check cannot follow at offset ${m.index}`);
    }
    expect(problems).toEqual([]);
    expect(Object.keys(found).length).toBeGreaterThan(20);
    const missing = Object.keys(found).filter((k) => !(k in ACTION_MATRIX));
    expect(missing, `add these actions to ACTION_MATRIX in tests/e2e/access-matrix.ts: ${missing.join(", ")}`).toEqual([]);
    const sorted = (r: readonly string[] | "public") => (r === "public" ? r : [...r].sort());
    const declared = Object.fromEntries(Object.entries(found).map(([k, r]) => [k, sorted(r)]));
    const table = Object.fromEntries(Object.entries(ACTION_MATRIX).map(([k, r]) => [k, sorted(r)]));
    expect(declared).toEqual(table);
  });
});
