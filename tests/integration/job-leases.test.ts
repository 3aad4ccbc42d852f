import { afterAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { testDatabase } from "../helpers/db";
import * as schema from "@/db/schema";
import { takeLease } from "@/db/mutations/job-leases";
import { runIfLeaseFree, stopBackgroundJobs } from "@/server/jobs";

const { db, pool } = testDatabase();

afterAll(async () => {
  await pool.end();
});

const expireNow = (name: string) => db.update(schema.jobLeases).set({ expiresAt: sql`NOW(3) - INTERVAL 1 SECOND` }).where(eq(schema.jobLeases.name, name));

describe("job leases across instances", () => {
  it("of instances asking for a free job at the same moment, exactly one gets it", async () => {
    const name = `test-race-${Date.now()}`;
    const won = await Promise.all(Array.from({ length: 8 }, (_, i) => takeLease(name, `instance-${i}`, 60)));
    expect(won.filter(Boolean)).toHaveLength(1);
    expect(await takeLease(name, "instance-late", 60)).toBe(false);
  });

  it("a job that ran is not run again by another instance in the same period", async () => {
    const job = { name: `test-period-${Date.now()}`, runs: 0, run: async () => void job.runs++ };
    expect(await runIfLeaseFree(job, 3600, "instance-a")).toBe(true);
    expect(await runIfLeaseFree(job, 3600, "instance-b")).toBe(false);
    expect(job.runs).toBe(1);
    // The period is over: whichever instance looks next runs it.
    await expireNow(job.name);
    expect(await runIfLeaseFree(job, 3600, "instance-b")).toBe(true);
    expect(job.runs).toBe(2);
  });

  it("a crashed holder's lease expires and another instance takes the job over", async () => {
    const name = `test-crash-${Date.now()}`;
    expect(await takeLease(name, "instance-that-dies", 600)).toBe(true);
    expect(await takeLease(name, "instance-b", 600)).toBe(false);
    await expireNow(name);
    expect(await takeLease(name, "instance-b", 600)).toBe(true);
  });

  it("shutdown gives up the lease of a run still going, so another instance need not wait for it to expire", async () => {
    let finish!: () => void;
    const job = { name: `test-shutdown-${Date.now()}`, run: () => new Promise<void>((r) => (finish = r)) };
    const running = runIfLeaseFree(job, 3600, "instance-stopping");
    await expect.poll(async () => (await db.select({ holder: schema.jobLeases.holder }).from(schema.jobLeases).where(eq(schema.jobLeases.name, job.name)))[0]?.holder).toBe("instance-stopping");
    expect(await takeLease(job.name, "instance-b", 600)).toBe(false);
    await stopBackgroundJobs();
    expect(await takeLease(job.name, "instance-b", 600)).toBe(true);
    finish();
    await running;
    // The stopped run finished after another instance took the job: the lease stays with that instance.
    const [lease] = await db.select({ holder: schema.jobLeases.holder }).from(schema.jobLeases).where(eq(schema.jobLeases.name, job.name));
    expect(lease!.holder).toBe("instance-b");
  });
});
