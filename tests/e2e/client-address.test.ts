// Per-address sign-in limits key on the address a request connects from, never on a header the client
// writes. Each test is a client of its own on a loopback address of its own (see helpers/from-address).
import { afterAll, describe, expect, it } from "vitest";
import { createDatabase } from "@/db/client";
import { insertThrowawayGrower } from "../helpers/throwaway-account";
import { SIGN_IN_FAILED, SIGN_IN_THROTTLED } from "@/lib/domain/sign-in-messages";
import { MAX_FAILURES_PER_ADDRESS } from "@/server/auth/throttle";
import { madeUpAddress, signInFrom, spareLoopbackAddress } from "../helpers/from-address";

const e2e = createDatabase(process.env.E2E_DATABASE_URL!, 2);
afterAll(async () => {
  await e2e.pool.end();
});

const newAccount = (tag: string) => insertThrowawayGrower(e2e, tag, "Address Check");

/** Failed sign-ins from `from`, each for an e-mail of its own so only the address limit can be reached. */
async function failFrom(from: string, times: number, headersFor: (i: number) => Record<string, string>) {
  for (let i = 0; i < times; i += 1) {
    const attempt = await signInFrom(from, `nobody-${i}-${Math.random().toString(36).slice(2)}@example.org`, "wrong-password-123", headersFor(i));
    expect([i, attempt.signedIn, attempt.error]).toEqual([i, false, SIGN_IN_FAILED]);
  }
}

describe("sign-in limits per client address", () => {
  it("20 failures sent with a forged X-Forwarded-For do not lock out the client whose address was forged", async () => {
    const neighbour = spareLoopbackAddress();
    const attacker = spareLoopbackAddress();
    const account = await newAccount("neighbour");
    await failFrom(attacker, MAX_FAILURES_PER_ADDRESS, () => ({ "X-Forwarded-For": neighbour, "X-Real-IP": neighbour }));
    const neighbourSignIn = await signInFrom(neighbour, account.email, account.password);
    expect([neighbourSignIn.signedIn, neighbourSignIn.error]).toEqual([true, null]);
  }, 60_000);

  it("a fresh forged address does not get a fresh budget: the client's own address has used it up", async () => {
    const attacker = spareLoopbackAddress();
    const account = await newAccount("fresh");
    await failFrom(attacker, MAX_FAILURES_PER_ADDRESS, () => ({ "X-Forwarded-For": madeUpAddress() }));
    const next = await signInFrom(attacker, account.email, account.password, { "X-Forwarded-For": madeUpAddress(), "X-Real-IP": madeUpAddress() });
    expect([next.signedIn, next.error]).toEqual([false, SIGN_IN_THROTTLED]);
    // Another client is not affected.
    const other = await signInFrom(spareLoopbackAddress(), account.email, account.password);
    expect(other.signedIn).toBe(true);
  }, 60_000);
});
