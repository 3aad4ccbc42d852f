// Results go public only through the review step: a trial still recording cannot be published.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { count, eq } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_STAFF } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";
import { canPublish, publishBlockReason, STAGE_MEANINGS } from "@/lib/domain/design/status";
import { TRIAL_STATUSES } from "@/lib/domain/vocabulary/enums";

vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { publishResults } = await import("@/server/publish/publish");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let rosa: Viewer;

beforeAll(async () => {
  rosa = await demoViewer(db, DEMO_STAFF[1].email);
});
afterAll(async () => {
  await pool.end();
  await appPool.end();
});

describe("trial stages", () => {
  it("says what every stage means, and publishes only from the review step or as a new version", () => {
    for (const status of TRIAL_STATUSES) expect(STAGE_MEANINGS[status].length).toBeGreaterThan(20);
    expect(TRIAL_STATUSES.filter(canPublish)).toEqual(["analysing", "published"]);
    expect(publishBlockReason("collecting")).toMatch(/^Move the trial to Analysing first/);
  });

  it("refuses to publish a trial that is still collecting data, and stores nothing", async () => {
    const [kale] = await db.select({ id: s.trials.id, status: s.trials.status }).from(s.trials).where(eq(s.trials.code, "TV27-KAL"));
    expect(kale!.status).toBe("collecting");
    const before = (await db.select({ n: count() }).from(s.publishedReports))[0]!.n;
    await expect(publishResults(rosa, { trialId: kale!.id, traitId: null, settings: { siteModel: "random", separation: "lsd" }, changeNote: null, confirmedLeftOut: [] })).rejects.toThrow(/Move the trial to Analysing first/);
    expect((await db.select({ n: count() }).from(s.publishedReports))[0]!.n).toBe(before);
    const [after] = await db.select({ status: s.trials.status }).from(s.trials).where(eq(s.trials.id, kale!.id));
    expect(after!.status).toBe("collecting");
  });
});
