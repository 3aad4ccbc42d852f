import { describe, expect, it } from "vitest";
import { publicCacheKey } from "@/lib/domain/publish/public-cache-key";
import { BoundedStore } from "@/lib/domain/cache/bounded-store";

describe("which public addresses the public cache keeps", () => {
  it("keeps the public pages and open data answers under the address as asked", () => {
    expect(publicCacheKey("/", "")).toBe("/");
    expect(publicCacheKey("/results", "?crop=Lettuce")).toBe("/results?crop=Lettuce");
    expect(publicCacheKey("/results/TV26-LET", "?version=2")).toBe("/results/TV26-LET?version=2");
    expect(publicCacheKey("/varieties/12", "")).toBe("/varieties/12");
    expect(publicCacheKey("/sites/3", "")).toBe("/sites/3");
    expect(publicCacheKey("/api/public/v1/trials/TV26-LET/plots", "")).toBe("/api/public/v1/trials/TV26-LET/plots");
    expect(publicCacheKey("/api/public/v1/openapi.json", "")).toBe("/api/public/v1/openapi.json");
  });

  it("never keeps portal pages, sign-in pages, downloads or router requests", () => {
    for (const path of ["/portal", "/portal/trials/1", "/sign-in", "/results/TV26-LET/report", "/results/TV26-LET/data", "/api/trials/1/analysis", "/api/auth/session"]) {
      expect([path, publicCacheKey(path, "")]).toEqual([path, null]);
    }
    expect(publicCacheKey("/results/TV26-LET", "?_rsc=abc")).toBeNull();
  });

  it("does not let odd queries make new entries: unknown, repeated, over-long or non-plain values are rendered as before", () => {
    expect(publicCacheKey("/", "?utm=1")).toBeNull();
    expect(publicCacheKey("/results/TV26-LET", "?version=1&version=2")).toBeNull();
    expect(publicCacheKey("/results/TV26-LET", "?version=01")).toBeNull();
    expect(publicCacheKey("/results/TV26-LET", "?version=1e3")).toBeNull();
    expect(publicCacheKey("/results", `?q=${"x".repeat(101)}`)).toBeNull();
    expect(publicCacheKey("/varieties/0", "")).toBeNull();
    expect(publicCacheKey("/results/NOT_A_CODE!", "")).toBeNull();
  });
});

describe("the public cache's store is bounded", () => {
  const entry = (bytes: number) => ({ bytes });

  it("drops the least recently used entry beyond its entry bound, whatever is asked for", () => {
    const store = new BoundedStore<{ bytes: number }>(3, 1_000_000);
    store.set("a", entry(1));
    store.set("b", entry(1));
    store.set("c", entry(1));
    store.get("a");
    for (let i = 0; i < 10_000; i += 1) store.set(`unknown-${i}`, entry(1));
    expect(store.size).toBe(3);
    expect(store.get("b")).toBeUndefined();
  });

  it("keeps its bytes within the byte bound and refuses an entry over a quarter of it", () => {
    const store = new BoundedStore<{ bytes: number }>(100, 1_000);
    for (let i = 0; i < 50; i += 1) store.set(`k${i}`, entry(200));
    expect(store.bytes).toBeLessThanOrEqual(1_000);
    expect(store.size).toBe(5);
    store.set("huge", entry(251));
    expect(store.get("huge")).toBeUndefined();
    store.set("k49", entry(100));
    expect(store.bytes).toBe(900);
    store.clear();
    expect([store.size, store.bytes]).toEqual([0, 0]);
  });
});
