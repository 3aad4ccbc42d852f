import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";

// Every route handler that takes a body goes through lib/http: the origin check, a reader with its
// route's limit, and closeUnreadBody around refusals. It also stays out of proxy.ts, which would otherwise
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

  it("check the origin, read the body only through the limited reader and settle an unread body on refusal", () => {
    const problems = writers.flatMap((file) => {
      const code = fs.readFileSync(file, "utf8");
      const name = path.relative(root, file);
      return [
        !code.includes("assertOwnOrigin(request)") && `${name}: no assertOwnOrigin`,
        !/read(?:Json|Form|ShortForm|Body)Within\(request, "/.test(code) && `${name}: no limited body reader`,
        /request\.(json|formData|text|arrayBuffer|blob)\(/.test(code) && `${name}: reads the body without a limit`,
        !code.includes("closeUnreadBody(request,") && `${name}: refusals do not settle an unread body`,
      ].filter(Boolean);
    });
    expect(problems).toEqual([]);
  });

  it("are left out of the proxy, while pages, reading routes and undecodable addresses still pass through it", () => {
    expect(writers.map(sampleAddress).filter(proxyRuns)).toEqual([]);
    for (const address of ["/", "/portal/catalogue", "/api/trials/1", "/api/photos/1", "/api/record/%FF/1/upload", "/api/auth/%FF", "/api/photos/x/../../portal"]) expect([address, proxyRuns(address)]).toEqual([address, true]);
  });
});
