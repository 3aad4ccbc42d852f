import { afterEach, describe, expect, it, vi } from "vitest";

// lib/env.ts parses process.env once, on import, so each case imports a fresh copy with its own settings.
async function envWith(trustedProxies: string) {
  vi.stubEnv("TRUSTED_PROXIES", trustedProxies);
  vi.resetModules();
  return (await import("@/lib/env")).env;
}

afterEach(() => {
  vi.unstubAllEnvs();
  vi.resetModules();
});

describe("settings: TRUSTED_PROXIES", () => {
  it("a bad entry stops the server at start-up, naming the entry", async () => {
    for (const bad of ["proxy.local", "10.0.0.0/33", "10.0.0.0/", "::1/129", "10.0.0.1/8/1"]) {
      await expect(envWith(`10.0.0.5, ${bad}`)).rejects.toThrow(new RegExp(`TRUSTED_PROXIES.*"${bad.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&")}" is not an IP address or a CIDR range`));
    }
  });

  it("reads addresses and CIDR ranges, separated by commas, and trusts nobody by default", async () => {
    expect((await envWith("10.0.0.5, 172.16.0.0/12, ::1, fd00::/8")).TRUSTED_PROXIES).toEqual(["10.0.0.5", "172.16.0.0/12", "::1", "fd00::/8"]);
    expect((await envWith("")).TRUSTED_PROXIES).toEqual([]);
  });
});
