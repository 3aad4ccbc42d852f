import { afterAll, beforeAll, describe, expect, it } from "vitest";
import sharp from "sharp";
import { createDatabase } from "@/db/client";
import { DEMO_PASSWORDS, DEMO_SITES } from "@/db/demo-data";
import { seededRandom } from "@/lib/domain/design/random";
import { BODY_LIMITS, type BodyKind } from "@/lib/domain/request-limits";
import type { SampleIds } from "./access-matrix";
import { httpSession, request, type HttpSession } from "../helpers/http";
import { loadSampleIds } from "../helpers/samples";
import { peakMemory, servingProcess, startPeakMemory } from "../helpers/server-process";
import { streamZeros } from "../helpers/stream-body";

// Request bodies against the running `next start`: every body is cut off at its route's limit while it
// streams in, whatever its headers and whether or not it declares a length, and the server's memory grows
// with the limit, not with the body.

const MB = 1024 * 1024;
// Far more than any limit, generated while it is sent (the test never holds it).
const HUGE = 400 * MB;
// Generous: several copies of the largest limit (photos, 15 MB) and the server's own churn, yet far below
// one HUGE body, which is what a server that buffers whole bodies grows by.
const MEMORY_BOUND = 160 * MB;

const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
let ids: SampleIds;
let grower: HttpSession;

beforeAll(async () => {
  ids = await loadSampleIds(e2e.pool);
  grower = await httpSession(DEMO_SITES[0].grower.email, DEMO_PASSWORDS.cooperator);
});
afterAll(async () => {
  await e2e.pool.end();
});

interface Target {
  label: string;
  kind: BodyKind;
  path: () => string;
  headers: () => Record<string, string>;
}

const TARGETS: Target[] = [
  { label: "sign-in callback, signed out", kind: "auth", path: () => "/api/auth/callback/credentials", headers: () => ({ "content-type": "application/x-www-form-urlencoded" }) },
  { label: "photo upload", kind: "photo", path: () => "/api/photos", headers: () => ({ "content-type": "multipart/form-data; boundary=zz", cookie: grower.cookie }) },
  { label: "spreadsheet upload", kind: "spreadsheet", path: () => `/api/record/${ids.kal}/${ids.siteA}/upload`, headers: () => ({ "content-type": "multipart/form-data; boundary=zz", cookie: grower.cookie }) },
  { label: "observation API", kind: "observations", path: () => "/api/observations", headers: () => ({ "content-type": "application/json", cookie: grower.cookie }) },
  // Any server action: the proxy refuses the body before Next looks the action up.
  { label: "server action on a page", kind: "pageForm", path: () => "/forgot-password", headers: () => ({ "content-type": "text/plain;charset=UTF-8", "next-action": "7f".repeat(21) }) },
];

const VARIANTS = [
  { label: "chunked, no length", prefetch: false, declareLength: false },
  { label: "chunked, no length, prefetch header", prefetch: true, declareLength: false },
  { label: "declared length, prefetch header", prefetch: true, declareLength: true },
  { label: "declared length", prefetch: false, declareLength: true },
];

async function sendAll(bytes: (t: Target) => number) {
  const answers: string[] = [];
  for (const target of TARGETS) {
    for (const variant of VARIANTS) {
      const headers = { ...target.headers(), ...(variant.prefetch ? { "next-router-prefetch": "1" } : {}) };
      const answer = await streamZeros(target.path(), bytes(target), { headers, declareLength: variant.declareLength });
      const message = answer.text.includes(BODY_LIMITS[target.kind].tooLarge) ? "limit message" : answer.text.slice(0, 200);
      answers.push(`${target.label}, ${variant.label}: ${answer.status} ${message}`);
    }
  }
  return answers;
}

describe("request body limits", () => {
  it("cuts every body off at its route's limit while it streams in (413 with the limit message), with or without a length or the prefetch header, and server memory grows by less than a bound far below the body", async () => {
    const server = servingProcess();
    // A first round just over each limit loads every route's code, so the measured round counts only bodies.
    const warmUp = await sendAll((t) => BODY_LIMITS[t.kind].bytes + 2 * MB);
    expect(warmUp.filter((a) => !a.endsWith(": 413 limit message"))).toEqual([]);

    const before = startPeakMemory(server);
    const answers = await sendAll(() => HUGE);
    const growth = peakMemory(server) - before;

    expect(answers.filter((a) => !a.endsWith(": 413 limit message"))).toEqual([]);
    expect(answers).toHaveLength(TARGETS.length * VARIANTS.length);
    expect(Math.round(growth / MB)).toBeLessThan(MEMORY_BOUND / MB);
  });

  it("accepts a 12 MB photo, between the old 10 MB cut and the 15 MB photo limit", async () => {
    // Seeded noise at full JPEG quality: about 12 MB from 2400 x 1800 pixels.
    const [width, height] = [2400, 1800];
    const random = seededRandom(20261204);
    const pixels = Buffer.alloc(width * height * 3);
    for (let i = 0; i < pixels.length; i++) pixels[i] = Math.floor(random() * 256);
    const photo = await sharp(pixels, { raw: { width, height, channels: 3 } }).jpeg({ quality: 100, chromaSubsampling: "4:4:4" }).toBuffer();
    expect(photo.length).toBeGreaterThan(10 * MB + MB);
    expect(photo.length).toBeLessThan(BODY_LIMITS.photo.fileBytes);

    const caption = `Limit check ${Date.now().toString(36)}`;
    const form = new FormData();
    form.set("trialId", String(ids.kal));
    form.set("siteId", String(ids.siteA));
    form.set("caption", caption);
    form.set("file", new Blob([new Uint8Array(photo)], { type: "image/jpeg" }), "whole-row.jpg");
    const response = await request("/api/photos", grower, { method: "POST", body: form });
    expect([response.status, await response.text()]).toEqual([200, expect.stringContaining('"contentType":"image/jpeg"')]);
    const [rows] = (await e2e.pool.query("SELECT COUNT(*) AS n FROM photos WHERE caption = ?", [caption])) as unknown as [{ n: number }[]];
    expect(Number(rows[0]!.n)).toBe(1);
  });
});
