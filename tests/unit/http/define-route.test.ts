import { beforeEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS } from "@/lib/domain/request-limits";
import type { Viewer } from "@/lib/domain/viewer";

// The builder's own refusals, answered before any handler runs. The signed-in viewer is stubbed: the real
// session lookup needs next-auth and a database, and what is tested here is the order of the checks.
let viewer: Viewer | null = null;
vi.mock("@/server/auth/guards", () => ({
  assertRole: async (...roles: string[]) => {
    if (!viewer) throw new AppError("unauthenticated", "Please sign in first.");
    if (roles.length > 0 && !roles.includes(viewer.role)) throw new AppError("forbidden", "Your account does not have access to this.");
    return viewer;
  },
}));

const { defineRoute } = await import("@/server/http/define-route");
const { env } = await import("@/lib/env");
const OWN = new URL(env.APP_URL).origin;
const CHUNK = 64 * 1024;

function streamingPost(totalBytes: number, headers: Record<string, string>) {
  let pulled = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (pulled >= totalBytes) return controller.close();
      pulled += CHUNK;
      controller.enqueue(new Uint8Array(CHUNK).fill(32));
    },
  }, { highWaterMark: 0 });
  const request = new Request(`${OWN}/api/x`, { method: "POST", body, headers, duplex: "half" } as RequestInit);
  return { request };
}

const ran = vi.fn();
const saveRoute = defineRoute({ roles: ["coordinator", "cooperator"], body: { kind: "observations", as: "json" } }, async ({ body }) => {
  ran(body);
  return Response.json({ saved: true });
});
const readRoute = defineRoute(
  { roles: "signed-in", params: { schema: z.object({ trialId: z.coerce.number().int().positive() }), message: "That trial does not exist." }, query: { schema: z.object({ q: z.string().max(3) }) } },
  async ({ params, query }) => Response.json({ params, query }),
);

beforeEach(() => {
  viewer = { id: 7, role: "cooperator" } as Viewer;
  ran.mockClear();
});

describe("a route built with defineRoute", () => {
  it("refuses a write sent from another website with 403, before the role check or the handler", async () => {
    viewer = null;
    const { request } = streamingPost(4 * CHUNK, { origin: "https://evil.example", "content-type": "application/json" });
    const response = await saveRoute(request);
    expect(response.status).toBe(403);
    expect(ran).not.toHaveBeenCalled();
  });

  it("refuses a signed-out write with 401 and a role it does not list with 403", async () => {
    viewer = null;
    expect((await saveRoute(streamingPost(1, { origin: OWN, "content-type": "application/json" }).request)).status).toBe(401);
    viewer = { id: 1, role: "admin" } as Viewer;
    expect((await saveRoute(streamingPost(1, { origin: OWN, "content-type": "application/json" }).request)).status).toBe(403);
    expect(ran).not.toHaveBeenCalled();
  });

  it("refuses a JSON body sent as another content type with 415, before the handler", async () => {
    const { request } = streamingPost(10 * CHUNK, { origin: OWN, "content-type": "text/plain" });
    expect((await saveRoute(request)).status).toBe(415);
    expect(ran).not.toHaveBeenCalled();
  });

  it("cuts a body off at its kind's limit with 413 and the kind's message, before the handler", async () => {
    const { request } = streamingPost(1024 * 1024 * 1024, { origin: OWN, "content-type": "application/json" });
    const response = await saveRoute(request);
    expect(response.status).toBe(413);
    expect((await response.json()).error).toBe(BODY_LIMITS.observations.tooLarge);
    expect(ran).not.toHaveBeenCalled();
  });

  it("hands the parsed body to the handler of a write from Seedplot's own pages", async () => {
    const request = new Request(`${OWN}/api/x`, { method: "POST", body: JSON.stringify({ a: 1 }), headers: { origin: OWN, "content-type": "application/json" } });
    expect((await saveRoute(request)).status).toBe(200);
    expect(ran).toHaveBeenCalledWith({ a: 1 });
  });

  it("answers a wrong id in the path with 404 and a wrong search term with 400", async () => {
    const bad = await readRoute(new Request(`${OWN}/api/x?q=ok`), { params: Promise.resolve({ trialId: "x" }) });
    expect([bad.status, (await bad.json()).error]).toEqual([404, "That trial does not exist."]);
    expect((await readRoute(new Request(`${OWN}/api/x?q=toolong`), { params: Promise.resolve({ trialId: "3" }) })).status).toBe(400);
    const good = await readRoute(new Request(`${OWN}/api/x?q=ok`), { params: Promise.resolve({ trialId: "3" }) });
    expect(await good.json()).toEqual({ params: { trialId: 3 }, query: { q: "ok" } });
  });
});
