// Asking for a reset link must not tell who has an account: the answer, and the work done before it,
// are the same for any e-mail, and no mail server is contacted until the answer has gone out.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import net from "node:net";
import path from "node:path";
import { mkdtempSync, promises as fs } from "node:fs";
import { tmpdir } from "node:os";
import { eq, inArray, like, or } from "drizzle-orm";
import * as s from "@/db/schema";
import { hashPassword } from "@/server/auth/password";
import { pool as appPool } from "@/db/index";
import { testDatabase, unique } from "../helpers/db";
import { startFakeSmtp } from "../../scripts/fake-smtp";

// What Next runs once the response has been sent; here the test decides when.
const afterResponse = vi.hoisted(() => [] as (() => unknown)[]);
vi.mock("next/server", async (importOriginal) => ({
  ...(await importOriginal<typeof import("next/server")>()),
  after: (task: () => unknown) => void afterResponse.push(task),
}));
vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));

const { requestPasswordReset } = await import("@/server/actions/auth");
const { runAsClientAddress } = await import("@/server/auth/request-address");

const { db, pool } = testDatabase();
const smtpPort = Number(process.env.SMTP_PORT);
const work = mkdtempSync(path.join(tmpdir(), "seedplot-reset-"));

beforeAll(() => {
  afterResponse.length = 0;
});
afterAll(async () => {
  await pool.end();
  await appPool.end();
  await fs.rm(work, { recursive: true, force: true });
});

async function account() {
  const email = `${unique("has-account")}@example.org`;
  await db.insert(s.users).values({ email, name: "Reset Timing", role: "cooperator", passwordHash: await hashPassword("password-for-timing") });
  const [u] = await db.select({ id: s.users.id }).from(s.users).where(eq(s.users.email, email));
  return { email, id: u!.id };
}

function ask(email: string, from: string) {
  const form = new FormData();
  form.set("email", email);
  return runAsClientAddress(from, () => requestPasswordReset(null, form));
}

/** What exists for an e-mail: its reset links, its queued mail and the limit entries counted for it. */
async function traces(email: string, from: string) {
  const tokens = await db
    .select({ id: s.userTokens.id })
    .from(s.userTokens)
    .innerJoin(s.users, eq(s.users.id, s.userTokens.userId))
    .where(eq(s.users.email, email));
  const mail = await db.select({ status: s.mailOutbox.status, attempts: s.mailOutbox.attempts }).from(s.mailOutbox).where(eq(s.mailOutbox.toAddress, email));
  const limits = await db
    .select({ key: s.signInAttempts.throttleKey })
    .from(s.signInAttempts)
    .where(or(inArray(s.signInAttempts.throttleKey, [`rate:reset-to:${email}`, `rate:reset-from:${from}`]), like(s.signInAttempts.throttleKey, `%${email}%`)));
  return { tokens: tokens.length, mail, limits: limits.map((l) => l.key.replace(email, "EMAIL").replace(from, "ADDRESS")).sort() };
}

async function runAfterResponse() {
  const tasks = afterResponse.splice(0);
  for (const task of tasks) await task();
}

describe("asking for a reset link", () => {
  it("does the same steps, and answers the same, whether or not the e-mail has an account", async () => {
    const known = await account();
    const unknown = `${unique("no-account")}@example.org`;
    const [fromKnown, fromUnknown] = ["10.77.0.1", "10.77.0.2"].map((a) => `${a}-${unique("x")}`);
    const answers = [await ask(known.email, fromKnown!), await ask(unknown, fromUnknown!)];
    expect(answers[0]).toEqual(answers[1]);
    expect(answers[0]).toMatchObject({ ok: true });
    // Up to the answer, each left the same traces: two limit entries, and no link or mail yet.
    const before = [await traces(known.email, fromKnown!), await traces(unknown, fromUnknown!)];
    expect(before[0]).toEqual(before[1]);
    expect(before[0]).toEqual({ tokens: 0, mail: [], limits: ["rate:reset-from:ADDRESS", "rate:reset-to:EMAIL"] });
    // Each left one piece of work for after the answer.
    expect(afterResponse.length).toBe(2);

    const smtp = await startFakeSmtp({ port: smtpPort, dir: path.join(work, "mailbox") });
    try {
      await runAfterResponse();
    } finally {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
    }
    expect(await traces(known.email, fromKnown!)).toMatchObject({ tokens: 1, mail: [{ status: "sent", attempts: 1 }] });
    expect(await traces(unknown, fromUnknown!)).toMatchObject({ tokens: 0, mail: [] });
  });

  it("answers without waiting on the mail server: with it stalled, the answer comes back untouched by it and the mail stays queued", async () => {
    const known = await account();
    // A mail server that accepts connections and never says a word.
    const held: net.Socket[] = [];
    const stalled = net.createServer((socket) => void held.push(socket));
    await new Promise<void>((resolve) => stalled.listen(smtpPort, "127.0.0.1", () => resolve()));
    try {
      const answer = await ask(known.email, `10.77.1.1-${unique("x")}`);
      expect(answer).toMatchObject({ ok: true });
      expect(held.length).toBe(0);
      // After the answer the link is issued and queued; delivery tries the stalled server and leaves it queued.
      await runAfterResponse();
      expect(held.length).toBeGreaterThan(0);
      expect(await traces(known.email, "-")).toMatchObject({ tokens: 1, mail: [{ status: "pending", attempts: 1 }] });
    } finally {
      for (const socket of held) socket.destroy();
      await new Promise<void>((resolve) => stalled.close(() => resolve()));
    }
  });
});
