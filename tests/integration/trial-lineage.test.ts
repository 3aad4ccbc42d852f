import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { statementsDuring } from "../helpers/statements";
import { DEMO_SECOND_PROGRAM, DEMO_STAFF } from "@/db/demo-data";

const { getTrialLineage } = await import("@/db/queries/trials");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let coordinator: Viewer;
let otherCoordinator: Viewer;
let trialId: number;

beforeAll(async () => {
  coordinator = await demoViewer(db, DEMO_STAFF[1].email);
  otherCoordinator = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  trialId = trial!.id;
});

afterAll(async () => {
  await pool.end();
  await appPool.end();
});

describe("a trial's lineage (planned from, followed by, open seasons)", () => {
  it("reads the trial's own row once, scoped to the viewer's programs", async () => {
    let lineage: Awaited<ReturnType<typeof getTrialLineage>> = null;
    const sent = await statementsDuring(appPool, async () => {
      lineage = await getTrialLineage(coordinator, trialId);
    });
    expect(lineage).toMatchObject({ previous: null, next: expect.any(Array), seasons: expect.any(Array) });
    const ownRow = sent.filter((q) => /from `trials`/i.test(q.sql) && /`trials`\.`id` = \?/.test(q.sql) && q.params.includes(trialId));
    expect(ownRow.map((q) => q.sql)).toHaveLength(1);
  });

  it("is nothing for a coordinator of another program or a grower", async () => {
    expect(await getTrialLineage(otherCoordinator, trialId)).toBeNull();
    expect(await getTrialLineage({ ...coordinator, role: "cooperator" }, trialId)).toBeNull();
  });
});
