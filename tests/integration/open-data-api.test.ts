import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Validator } from "@seriousme/openapi-schema-validator";
import { Ajv2020 } from "ajv/dist/2020.js";
import addFormats from "ajv-formats";
import { desc, eq, gt, and, like } from "drizzle-orm";
import * as s from "@/db/schema";
import { DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";
import type { Viewer } from "@/lib/domain/viewer";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

// The open data API (/api/public/v1/...) is described by an OpenAPI 3.1 document. The document itself is
// checked against the OpenAPI 3.1 schema (@seriousme/openapi-schema-validator), and every answer the demo
// gives is checked against the document's response schemas with Ajv's JSON Schema 2020-12 validator, the
// dialect OpenAPI 3.1 uses.

const { GET: openapi } = await import("@/app/api/public/v1/openapi.json/route");
const { GET: trialList } = await import("@/app/api/public/v1/trials/route");
const { GET: trialOne } = await import("@/app/api/public/v1/trials/[code]/route");
const { GET: trialResults } = await import("@/app/api/public/v1/trials/[code]/results/route");
const { GET: trialPlots } = await import("@/app/api/public/v1/trials/[code]/plots/route");
const { GET: legacyList } = await import("@/app/api/public/trials/route");
const { GET: legacyOne } = await import("@/app/api/public/trials/[code]/route");
const { withdrawResults, publishResults } = await import("@/server/publish/publish");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
const PUBLISHED = DEMO_TRIALS.filter((t) => t.publishedAtSeed).map((t) => t.code);
const UNPUBLISHED = DEMO_TRIALS.filter((t) => !t.publishedAtSeed).map((t) => t.code);

type Route = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;
const byCode: Record<string, Route> = { "": trialOne, "/results": trialResults, "/plots": trialPlots };
const pathOf: Record<string, string> = { "": "/trials/{code}", "/results": "/trials/{code}/results", "/plots": "/trials/{code}/plots" };

const call = (route: Route, url: string, params: Record<string, string> = {}) => route(new Request(`http://t${url}`), { params: Promise.resolve(params) });

let document: Record<string, unknown>;
let ajv: Ajv2020;
let coordinator: Viewer;

/** Validates a body against the document's schema for that path and status. */
function expectValid(path: string, status: number, body: unknown) {
  const pointer = `openapi.json#/paths/${path.replaceAll("~", "~0").replaceAll("/", "~1")}/get/responses/${status}/content/application~1json/schema`;
  const validate = ajv.getSchema(pointer);
  expect(validate, pointer).toBeDefined();
  const ok = validate!(body);
  expect(validate!.errors ?? [], `${path} ${status}`).toEqual([]);
  expect(ok).toBe(true);
}

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  document = await (await call(openapi as Route, "/api/public/v1/openapi.json")).json();
  // OpenAPI keywords beside the schemas (paths, responses, ...) are not JSON Schema, hence strict off.
  ajv = new Ajv2020({ strict: false, allErrors: true });
  addFormats(ajv);
  ajv.addSchema(document, "openapi.json");
});

afterAll(async () => {
  await pool.end();
  await appPool.end();
});

describe("the open data API keeps to its OpenAPI 3.1 document", () => {
  it("the document is a valid OpenAPI 3.1 document and is served with a cache header", async () => {
    const res = await call(openapi as Route, "/api/public/v1/openapi.json");
    expect(res.headers.get("cache-control")).toMatch(/public/);
    const result = await new Validator().validate(document);
    expect(result.valid, JSON.stringify(result.errors)).toBe(true);
    // the validator does refuse a broken document (a response without its required description)
    const broken = await new Validator().validate({ ...document, paths: { "/x": { get: { responses: { "200": {} } } } } });
    expect(broken.valid).toBe(false);
    expect(document.openapi).toMatch(/^3\.1\./);
  });

  it("every answer of the demo (list, each published trial, its results and plots, by version too) matches the document", async () => {
    expect(PUBLISHED.length).toBeGreaterThan(0);
    const list = await call(trialList as Route, "/api/public/v1/trials");
    expect(list.status).toBe(200);
    expect(list.headers.get("cache-control")).toBe("public, no-cache");
    const index = await list.json();
    expectValid("/trials", 200, index);
    expect(index.trials.map((t: { code: string }) => t.code).sort()).toEqual([...PUBLISHED].sort());
    expectValid("/trials", 200, await (await call(trialList as Route, "/api/public/v1/trials?q=spinach&season=Spring%202026")).json());

    for (const code of PUBLISHED) {
      const latest = index.trials.find((t: { code: string }) => t.code === code).version;
      for (const suffix of ["", "/results", "/plots"]) {
        for (const query of ["", `?version=${latest}`]) {
          const res = await call(byCode[suffix]!, `/api/public/v1/trials/${code}${suffix}${query}`, { code });
          expect(res.status, `${code}${suffix}${query}`).toBe(200);
          expect(res.headers.get("cache-control")).toBe("public, no-cache");
          expect(res.headers.get("access-control-allow-origin")).toBe("*");
          const body = await res.json();
          expectValid(pathOf[suffix]!, 200, body);
          // no internal ids anywhere: things are named by code, blind code, plot code and site name
          expect(JSON.stringify(body)).not.toMatch(/"[A-Za-z]*[iI]d":/);
        }
      }
      const results = await (await call(trialResults as Route, `/api/public/v1/trials/${code}/results`, { code })).json();
      const means = results.results.flatMap((r: { result: { means: { percentOfCheck: number | null; isCheck: boolean }[] } | null }) => r.result?.means ?? []);
      expect(means.length).toBeGreaterThan(0);
      // the check is 100% of itself (no percentage at all where its mean is at or below zero)
      const checks = means.filter((m: { isCheck: boolean }) => m.isCheck).map((m: { percentOfCheck: number | null }) => m.percentOfCheck);
      expect(checks.filter((p: number | null) => p !== null).length).toBeGreaterThan(0);
      for (const p of checks) if (p !== null) expect(p).toBeCloseTo(100, 9);
    }
  });

  it("unpublished and malformed addresses answer 404 in the documented error shape", async () => {
    for (const code of [...UNPUBLISHED, "NOPE-1", "' OR 1=1"]) {
      for (const suffix of ["", "/results", "/plots"]) {
        const res = await call(byCode[suffix]!, `/api/public/v1/trials/${encodeURIComponent(code)}${suffix}`, { code });
        expect(res.status, `${code}${suffix}`).toBe(404);
        expectValid(pathOf[suffix]!, 404, await res.json());
      }
    }
    const code = PUBLISHED[0]!;
    for (const v of ["0", "999", "1.5", "x"]) expect((await call(trialOne as Route, `/api/public/v1/trials/${code}?version=${v}`, { code })).status).toBe(404);
    expect((await call(trialList as Route, `/api/public/v1/trials?q=${"x".repeat(101)}`)).status).toBe(400);
  });

  it("the first, unversioned addresses redirect permanently to version 1, query kept", async () => {
    const list = await call(legacyList as Route, "/api/public/trials?q=spinach");
    expect(list.status).toBe(308);
    expect(list.headers.get("location")).toBe("/api/public/v1/trials?q=spinach");
    const one = await call(legacyOne as Route, "/api/public/trials/TV26-SPN?version=1", { code: "TV26-SPN" });
    expect(one.status).toBe(308);
    expect(one.headers.get("location")).toBe("/api/public/v1/trials/TV26-SPN?version=1");
  });

  it("a withdrawn trial answers 404 on every API address until it is published again", async () => {
    const code = PUBLISHED[0]!;
    const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, code));
    const [lastMail] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
    const live = await (await call(trialOne as Route, `/api/public/v1/trials/${code}`, { code })).json();
    await withdrawResults(coordinator, { trialId: trial!.id, reason: "Checking the open data API hides withdrawn results." });
    try {
      for (const suffix of ["", "/results", "/plots"]) {
        for (const query of ["", `?version=${live.version}`]) expect((await call(byCode[suffix]!, `/api/public/v1/trials/${code}${suffix}${query}`, { code })).status).toBe(404);
      }
      const index = await (await call(trialList as Route, "/api/public/v1/trials")).json();
      expect(index.trials.map((t: { code: string }) => t.code)).not.toContain(code);
    } finally {
      // Published again as a new version, as a coordinator would after a withdrawal.
      await publishResults(coordinator, { trialId: trial!.id, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: "Published again after a withdrawal check.", confirmedLeftOut: [] });
      await db.delete(s.mailOutbox).where(and(gt(s.mailOutbox.id, lastMail?.id ?? 0), like(s.mailOutbox.subject, "Results published:%")));
    }
    const again = await call(trialOne as Route, `/api/public/v1/trials/${code}`, { code });
    expect(again.status).toBe(200);
    expectValid("/trials/{code}", 200, await again.json());
  });
});
