// Which way is better is set per trait of a trial by its own program's staff; every ranking and "best"
// claim of the analysis follows it at once (the cached analysis is not served after a change).
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import type { AnalysisResult } from "@/lib/domain/analysis/types";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF } from "@/db/demo-data";
import { testDatabase } from "../helpers/db";
import { demoViewer } from "../helpers/demo";

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { setDirection } = await import("@/server/actions/trials");
const { GET } = await import("@/app/api/trials/[trialId]/analysis/route");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let rosa: Viewer;
let trialId: number;
let harvestId: number;

function form(values: Record<string, string | number>) {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, String(v));
  return f;
}

async function analysis(): Promise<AnalysisResult> {
  const res = await GET(new Request(`http://test.local/api/trials/${trialId}/analysis?trait=${harvestId}&unaccepted=1`), { params: Promise.resolve({ trialId: String(trialId) }) });
  expect(res.status).toBe(200);
  return (await res.json()) as AnalysisResult;
}

async function storedDirection() {
  const [row] = await db.select({ b: s.trialTraits.betterWhen }).from(s.trialTraits).where(and(eq(s.trialTraits.trialId, trialId), eq(s.trialTraits.traitId, harvestId)));
  return row!.b;
}

beforeAll(async () => {
  rosa = await demoViewer(db, DEMO_STAFF[1].email);
  const [trial] = await db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, "TV26-LET"));
  trialId = trial!.id;
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "harvest_date"));
  harvestId = trait!.id;
});

afterAll(async () => {
  await db.update(s.trialTraits).set({ betterWhen: null }).where(and(eq(s.trialTraits.trialId, trialId), eq(s.trialTraits.traitId, harvestId)));
  await pool.end();
  await appPool.end();
});

describe("a trial trait's direction", () => {
  it("follows the trait library until the coordinator sets one: days to first harvest has no preference", async () => {
    auth.viewer = rosa;
    const r = await analysis();
    expect(r.trait.betterWhen).toBe("neither");
    expect(r.combined!.means.every((m) => m.rank === null)).toBe(true);
    expect(r.notes.join(" ")).not.toMatch(/best/i);
  });

  it("lower is better ranks the earliest variety first, in the combined and every per-site table", async () => {
    auth.viewer = rosa;
    const result = await setDirection(null, form({ trialId, traitId: harvestId, betterWhen: "lower" }));
    expect(result).toMatchObject({ ok: true });
    expect(await storedDirection()).toBe("lower");
    const r = await analysis();
    expect(r.trait.betterWhen).toBe("lower");
    for (const block of [r.combined!, ...r.perSite.flatMap((p) => (p.result ? [p.result] : []))]) {
      const earliest = Math.min(...block.means.map((m) => m.lsMean ?? m.mean));
      expect(block.means.find((m) => m.rank === 1)!.lsMean ?? block.means.find((m) => m.rank === 1)!.mean).toBe(earliest);
    }
    expect(r.notes.find((n) => n.startsWith("Best combined mean (earliest)"))).toBeDefined();
  });

  it("higher is better turns the order round, and 'default' goes back to the library", async () => {
    auth.viewer = rosa;
    await setDirection(null, form({ trialId, traitId: harvestId, betterWhen: "higher" }));
    const r = await analysis();
    const latest = Math.max(...r.combined!.means.map((m) => m.lsMean ?? m.mean));
    expect(r.combined!.means.find((m) => m.rank === 1)!.lsMean ?? r.combined!.means.find((m) => m.rank === 1)!.mean).toBe(latest);
    await setDirection(null, form({ trialId, traitId: harvestId, betterWhen: "default" }));
    expect(await storedDirection()).toBeNull();
    expect((await analysis()).trait.betterWhen).toBe("neither");
  });

  it("is refused to a grower and to another program's coordinator, and changes nothing", async () => {
    auth.viewer = await demoViewer(db, DEMO_SITES[0].grower.email);
    expect(await setDirection(null, form({ trialId, traitId: harvestId, betterWhen: "lower" }))).toMatchObject({ ok: false });
    auth.viewer = await demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email);
    const other = await setDirection(null, form({ trialId, traitId: harvestId, betterWhen: "lower" }));
    expect(other).toMatchObject({ ok: false });
    expect(JSON.stringify(other)).not.toContain("TV26");
    expect(await storedDirection()).toBeNull();
  });

  it("refuses a direction that is not one of the three, and a trait the trial does not record", async () => {
    auth.viewer = rosa;
    const bad = await setDirection(null, form({ trialId, traitId: harvestId, betterWhen: "sideways" }));
    expect(bad).toMatchObject({ ok: false });
    expect(JSON.stringify(bad)).toContain("higher is better, lower is better, or no preference");
    const [tipburn] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, DEMO_SECOND_PROGRAM.trait.code));
    const foreign = await setDirection(null, form({ trialId, traitId: tipburn!.id, betterWhen: "lower" }));
    expect(foreign).toMatchObject({ ok: false, formError: "That trait is not recorded in this trial." });
    expect(await storedDirection()).toBeNull();
  });
});
