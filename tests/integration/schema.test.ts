import { afterAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import * as s from "@/db/schema";
import { testDatabase, unique } from "../helpers/db";

const { db, pool } = testDatabase();
afterAll(() => pool.end());

// MariaDB error numbers: 1062 duplicate key, 1452 foreign key violation.
async function errorNumber(p: Promise<unknown>): Promise<number | undefined> {
  try {
    await p;
    return undefined;
  } catch (e) {
    const err = e as { errno?: number; cause?: { errno?: number } };
    return err.errno ?? err.cause?.errno;
  }
}

async function firstTrial() {
  const [trial] = await db.select().from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  const entries = await db.select().from(s.trialEntries).where(eq(s.trialEntries.trialId, trial!.id));
  return { trial: trial!, entries };
}

describe("schema constraints", () => {
  it("refuses a second account with the same e-mail", async () => {
    const email = `${unique("dup")}@example.org`;
    await db.insert(s.users).values({ email, name: "First", role: "cooperator" });
    expect(await errorNumber(db.insert(s.users).values({ email, name: "Second", role: "cooperator" }))).toBe(1062);
  });

  it("refuses a blind code used twice in one trial", async () => {
    const { trial, entries } = await firstTrial();
    const [crop] = await db.select().from(s.crops).where(eq(s.crops.id, trial.cropId));
    const [variety] = await db.insert(s.varieties).values({ programId: trial.programId, cropId: crop!.id, name: unique("Variety") }).$returningId();
    const insert = db.insert(s.trialEntries).values({ trialId: trial.id, varietyId: variety!.id, blindCode: entries[0]!.blindCode, entryNumber: 99 });
    expect(await errorNumber(insert)).toBe(1062);
  });

  it("refuses a plot whose entry does not exist", async () => {
    const [plot] = await db.select().from(s.plots).limit(1);
    const orphan = db.insert(s.plots).values({ ...plot!, id: undefined, plotCode: unique("X").slice(0, 20), position: 99, entryId: 987654321 });
    expect(await errorNumber(orphan)).toBe(1452);
  });

  it("keeps one value per plot, trait and occasion", async () => {
    const [obs] = await db.select().from(s.observations).limit(1);
    const again = db.insert(s.observations).values({ plotId: obs!.plotId, traitId: obs!.traitId, occasion: obs!.occasion, valueNumber: 1 });
    expect(await errorNumber(again)).toBe(1062);
  });

  it("refuses a site enrolled twice in the same trial", async () => {
    const [enrolment] = await db.select().from(s.enrolments).limit(1);
    const again = db.insert(s.enrolments).values({ trialId: enrolment!.trialId, siteId: enrolment!.siteId });
    expect(await errorNumber(again)).toBe(1062);
  });

  it("refuses a role outside admin, coordinator and cooperator", async () => {
    // Strict SQL mode makes MariaDB reject an invalid enum value instead of storing an empty string.
    const bad = db.insert(s.users).values({ email: `${unique("role")}@example.org`, name: "X", role: "gardener" as "admin" });
    expect(await errorNumber(bad)).toBe(1265);
  });
});
