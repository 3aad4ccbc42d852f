import { describe, expect, it } from "vitest";
import { isAppError } from "@/lib/errors";
import { BODY_LIMITS } from "@/lib/domain/request-limits";
import { readBodyWithin, readJsonWithin } from "@/server/http/body";
import { isOwnOriginWrite } from "@/server/http/origin";

const CHUNK = 64 * 1024;

/** A request whose body is produced only as it is read, counting what was read, with no declared length. */
function endlessRequest(totalBytes: number, headers: Record<string, string> = {}) {
  let pulled = 0;
  const chunk = new Uint8Array(CHUNK);
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (pulled >= totalBytes) return controller.close();
      pulled += CHUNK;
      controller.enqueue(chunk);
    },
  }, { highWaterMark: 0 });
  const request = new Request("http://localhost/api/x", { method: "POST", body, headers, duplex: "half" } as RequestInit);
  return { request, pulled: () => pulled };
}

async function refusal(promise: Promise<unknown>) {
  try {
    await promise;
  } catch (e) {
    if (isAppError(e)) return { status: e.status, message: e.message };
    throw e;
  }
  return null;
}

describe("reading a request body within its limit", () => {
  it("stops reading a body with no length one chunk past the limit and refuses it with 413", async () => {
    const { request, pulled } = endlessRequest(1024 * 1024 * 1024);
    expect(await refusal(readBodyWithin(request, "observations"))).toEqual({ status: 413, message: BODY_LIMITS.observations.tooLarge });
    expect(pulled()).toBeLessThanOrEqual(BODY_LIMITS.observations.bytes + CHUNK);
  });

  it("refuses a declared length over the limit before reading anything", async () => {
    const { request, pulled } = endlessRequest(1024 * 1024 * 1024, { "content-length": String(BODY_LIMITS.auth.bytes + 1) });
    expect(await refusal(readBodyWithin(request, "auth"))).toEqual({ status: 413, message: BODY_LIMITS.auth.tooLarge });
    expect(pulled()).toBe(0);
  });

  it("accepts a body exactly at the limit, whole", async () => {
    const bytes = BODY_LIMITS.auth.bytes;
    const request = new Request("http://localhost/api/x", { method: "POST", body: new Uint8Array(bytes).fill(97) });
    expect((await readBodyWithin(request, "auth")).byteLength).toBe(bytes);
  });

  it("refuses JSON sent as another content type with 415, without reading it", async () => {
    const { request, pulled } = endlessRequest(10 * CHUNK, { "content-type": "text/plain" });
    expect(await refusal(readJsonWithin(request, "observations"))).toEqual({ status: 415, message: expect.stringMatching(/as JSON/) });
    expect(pulled()).toBe(0);
  });
});

describe("which writes count as Seedplot's own", () => {
  const own = "https://trials.example.edu";
  const decide = (headers: Record<string, string>) => isOwnOriginWrite(new Headers(headers), own);

  it("lets Origin decide whenever it is sent, even against Sec-Fetch-Site or Referer", () => {
    expect(decide({ origin: own })).toBe(true);
    expect(decide({ origin: "https://other.example.edu", "sec-fetch-site": "same-origin", referer: `${own}/portal` })).toBe(false);
    expect(decide({ origin: "null", referer: `${own}/portal` })).toBe(false);
    expect(decide({ origin: "http://trials.example.edu" })).toBe(false);
  });

  it("without Origin, takes Sec-Fetch-Site, then the Referer; a sibling host of the same site is foreign", () => {
    expect(decide({ "sec-fetch-site": "same-origin" })).toBe(true);
    expect(decide({ "sec-fetch-site": "same-site" })).toBe(false);
    expect(decide({ "sec-fetch-site": "cross-site", referer: `${own}/portal` })).toBe(false);
    expect(decide({ referer: `${own}/portal/record` })).toBe(true);
    expect(decide({ referer: "https://sibling.example.edu/" })).toBe(false);
    expect(decide({ referer: "not a url" })).toBe(false);
  });

  it("leaves a request no browser page sent (no Origin, Sec-Fetch-Site or Referer) to the role checks", () => {
    expect(decide({})).toBe(true);
  });
});
