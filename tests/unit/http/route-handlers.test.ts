import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { BODY_LIMITS } from "@/lib/domain/request-limits";

// Every route handler goes through defineRoute (server/http/define-route.ts), and one that takes a body
// names its kind from BODY_LIMITS: the builder then checks the origin, reads the body only within that
// kind's limit, and settles an unread body around refusals. It also stays out of proxy.ts, which would otherwise
// make Next copy the whole body and wait for its end before the route could cut it off.

const root = path.resolve(import.meta.dirname, "../../..");

function routeFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) return routeFiles(full);
    return e.name === "route.ts" ? [full] : [];
  });
}

/** An address the route answers: groups dropped, [id] as 1, a catch-all as two plain segments. */
function sampleAddress(file: string): string {
  const segments = path.relative(path.join(root, "app"), path.dirname(file)).split(path.sep);
  return "/" + segments.filter((s) => !/^\(.*\)$/.test(s)).map((s) => (s.startsWith("[...") ? "callback/credentials" : s.startsWith("[") ? "1" : s)).join("/");
}

const proxySource = fs.readFileSync(path.join(root, "proxy.ts"), "utf8");
const matcher = /matcher: \["([^"]+)"\]/.exec(proxySource)?.[1]?.replace(/\\\\/g, "\\");
const proxyRuns = (address: string) => new RegExp(`^${matcher}$`).test(address);

const WRITES = /export (?:async function|const|\{[^}]*\bas) ?(POST|PUT|PATCH|DELETE)\b|as (POST|PUT|PATCH|DELETE)\b/;

describe("route handlers that take a body", () => {
  const writers = routeFiles(path.join(root, "app")).filter((f) => WRITES.test(fs.readFileSync(f, "utf8")));

  it("exist (the observation, photo, spreadsheet and sign-in routes at least)", () => {
    expect(writers.map(sampleAddress)).toEqual(expect.arrayContaining(["/api/observations", "/api/photos", "/api/record/1/1/upload", "/api/auth/callback/credentials"]));
    expect(matcher).toBeTruthy();
  });

  it("are built with defineRoute and a body kind from BODY_LIMITS, and never read the body themselves", () => {
    const problems = writers.flatMap((file) => {
      const code = fs.readFileSync(file, "utf8");
      const name = path.relative(root, file);
      const writes = [...code.matchAll(/export const (POST|PUT|PATCH|DELETE) = defineRoute\(\s*\{([^]*?)\}\s*,\s*async/g)];
      const declared = [...code.matchAll(/export (?:async function|const) (POST|PUT|PATCH|DELETE)\b/g)].length + [...code.matchAll(/as (POST|PUT|PATCH|DELETE)\b/g)].length;
      return [
        writes.length !== declared && `${name}: a write handler not built with defineRoute`,
        ...writes.map(([, method, options]) => {
          const kind = /body: \{ kind: "(\w+)"/.exec(options!)?.[1];
          return (!kind || !(kind in BODY_LIMITS)) && `${name}: ${method} has no body kind from BODY_LIMITS`;
        }),
        /request\.(json|formData|text|arrayBuffer|blob)\(|request\.body\b/.test(code) && `${name}: reads the body without a limit`,
      ].filter(Boolean);
    });
    expect(problems).toEqual([]);
  });

  it("defineRoute checks the origin of state-changing requests, reads bodies only through the limited readers and settles an unread body on refusal", () => {
    const code = fs.readFileSync(path.join(root, "server/http/define-route.ts"), "utf8");
    expect(code).toMatch(/if \(!SAFE_METHODS\.has\(request\.method\.toUpperCase\(\)\)\) assertOwnOrigin\(request\);/);
    expect(code).toMatch(/readJsonWithin\(request, body\.kind\)/);
    expect(code).toMatch(/readFormWithin\(request, body\.kind\)/);
    expect(code).toMatch(/readShortFormWithin\(request, body\.kind\)/);
    expect(code).toContain("closeUnreadBody(request, toResponse(e))");
    expect(code).not.toMatch(/request\.(json|formData|text|arrayBuffer|blob)\(/);
  });

  it("every route handler under app/api is built with defineRoute (next-auth's own GET aside)", () => {
    const handlers = routeFiles(path.join(root, "app/api")).flatMap((file) => {
      const code = fs.readFileSync(file, "utf8");
      return [...code.matchAll(/export (?:async function|const) (GET|HEAD|POST|PUT|PATCH|DELETE)\b( = defineRoute\()?/g)].map((m) => [path.relative(root, file), m[1], Boolean(m[2])]);
    });
    expect(handlers.length).toBeGreaterThanOrEqual(16);
    expect(handlers.filter(([, , built]) => !built)).toEqual([]);
  });

  it("are left out of the proxy, while pages, reading routes and undecodable addresses still pass through it", () => {
    expect(writers.map(sampleAddress).filter(proxyRuns)).toEqual([]);
    for (const address of ["/", "/portal/catalogue", "/api/trials/1", "/api/photos/1", "/api/record/%FF/1/upload", "/api/auth/%FF", "/api/photos/x/../../portal"]) expect([address, proxyRuns(address)]).toEqual([address, true]);
  });
});
