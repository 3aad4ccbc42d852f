import { afterAll, describe, expect, it } from "vitest";
import { isThrottled, MAX_FAILURES_PER_ACCOUNT, recordAttempt } from "@/server/auth/throttle";
import { pool } from "@/db/index";
import { unique } from "../helpers/db";

afterAll(() => pool.end());

describe("sign-in throttling", () => {
  it("blocks an account after repeated failures and not before", async () => {
    const email = `${unique("guess")}@example.org`;
    for (let i = 0; i < MAX_FAILURES_PER_ACCOUNT - 1; i += 1) await recordAttempt(email, "10.0.0.1", false);
    expect(await isThrottled(email, "10.0.0.2")).toBe(false);
    await recordAttempt(email, "10.0.0.1", false);
    // Throttled by account even from another address.
    expect(await isThrottled(email, "10.0.0.3")).toBe(true);
  });

  it("clears the account's failures after a successful sign-in", async () => {
    const email = `${unique("typo")}@example.org`;
    for (let i = 0; i < 3; i += 1) await recordAttempt(email, "10.0.1.1", false);
    await recordAttempt(email, "10.0.1.1", true);
    for (let i = 0; i < 3; i += 1) await recordAttempt(email, "10.0.1.1", false);
    expect(await isThrottled(email, "10.0.1.9")).toBe(false);
  });
});

describe("rate limits on mail-sending actions", () => {
  it("allows up to the limit per key within the window, then refuses", async () => {
    const { consumeRateLimit } = await import("@/server/auth/throttle");
    const target = unique("invite-to");
    const limits = [{ key: target, max: 3 }];
    expect(await consumeRateLimit(limits, 60)).toBe(true);
    expect(await consumeRateLimit(limits, 60)).toBe(true);
    expect(await consumeRateLimit(limits, 60)).toBe(true);
    expect(await consumeRateLimit(limits, 60)).toBe(false);
    // Another key is unaffected.
    expect(await consumeRateLimit([{ key: unique("other"), max: 3 }], 60)).toBe(true);
  });
});

describe("concurrent sign-ins", () => {
  it("record many attempts at once without deadlocking", async () => {
    const email = `${unique("busy")}@example.org`;
    const results = await Promise.allSettled(Array.from({ length: 12 }, (_, i) => recordAttempt(email, "10.0.2.1", i % 3 !== 0)));
    expect(results.filter((r) => r.status === "rejected")).toEqual([]);
    expect(await isThrottled(email, "10.0.2.2")).toBe(false);
  });
});
