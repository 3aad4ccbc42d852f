import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { refusal } from "../helpers/refusal";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { StaleValuesError } from "@/server/observations/save";

// Saves the phone sends when the signal comes back: each with its own id, and with what the phone last knew
// as saved in the slot, so a repeat is written once and a coordinator's newer value is never overwritten.

const { db, pool } = testDatabase();
let luis: Viewer;
let mei: Viewer;
let rosa: Viewer;
let site: Awaited<ReturnType<typeof demoSite>>;
let cedar: Awaited<ReturnType<typeof demoSite>>;
const TRAIT = "quality";

const saveAs = (viewer: Viewer, body: Record<string, unknown>) => saveObservationsForViewer(viewer, { trialId: site.trialId, siteId: site.siteId, ...body });

async function storedNote(plotId: number) {
  const [o] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plotId), eq(s.observations.traitId, site.traitId[TRAIT]!)));
  return o ?? null;
}

async function historyCount(plotId: number) {
  const o = await storedNote(plotId);
  if (!o) return 0;
  return (await db.select().from(s.observationHistory).where(eq(s.observationHistory.observationId, o.id))).length;
}

beforeAll(async () => {
  [luis, mei, rosa] = await Promise.all([demoViewer(db, "luis@brightwater.example"), demoViewer(db, "mei@cedarhollow.example"), demoViewer(db, "rosa.delgado@tamarack-valley.example")]);
  site = await demoSite(db, "TV27-KAL", "Brightwater Flower Farm");
  cedar = await demoSite(db, "TV27-KAL", "Cedar Hollow Market Garden");
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, site.plots.map((p) => p.id)), eq(s.observations.traitId, site.traitId[TRAIT]!)));
});

afterAll(async () => {
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, site.plots.map((p) => p.id)), eq(s.observations.traitId, site.traitId[TRAIT]!)));
  await db.delete(s.clientSaves).where(inArray(s.clientSaves.userId, [luis.id, mei.id, rosa.id]));
  await pool.end();
});

describe("saves the phone sends again are written once", () => {
  it("a save sent twice with the same id is written once and the repeat answers what the first did; ids are per user", async () => {
    const plot = site.plots[0]!;
    const clientSaveId = crypto.randomUUID();
    const body = { clientSaveId, values: [{ plotId: plot.id, key: TRAIT, value: "3" }] };
    const first = await saveAs(luis, body);
    expect(first).toMatchObject({ saved: 1, counts: { new: 1 } });
    // Between the two sends the grower types something else in the slot; the repeat must not undo it.
    await saveAs(luis, { clientSaveId: crypto.randomUUID(), values: [{ plotId: plot.id, key: TRAIT, value: "4" }] });
    const again = await saveAs(luis, body);
    expect(again).toEqual(first);
    expect((await storedNote(plot.id))!.valueNumber).toBe(4);
    expect(await historyCount(plot.id)).toBe(1);
    expect(await db.select().from(s.clientSaves).where(and(eq(s.clientSaves.userId, luis.id), eq(s.clientSaves.clientSaveId, clientSaveId)))).toHaveLength(1);

    // Another user's save with the same id is their own: it neither replays Luis's answer nor is blocked.
    const meiSave = await saveObservationsForViewer(mei, { trialId: cedar.trialId, siteId: cedar.siteId, clientSaveId, values: [{ plotId: cedar.plots[0]!.id, key: TRAIT, value: "6" }, { plotId: cedar.plots[1]!.id, key: TRAIT, value: "6" }] });
    expect(meiSave).toMatchObject({ saved: 2, counts: { new: 2 } });
    await db.delete(s.observations).where(and(inArray(s.observations.plotId, [cedar.plots[0]!.id, cedar.plots[1]!.id]), eq(s.observations.traitId, cedar.traitId[TRAIT]!)));
  });

  it("two sends of the same save at once write it once", async () => {
    const plot = site.plots[1]!;
    const body = { clientSaveId: crypto.randomUUID(), values: [{ plotId: plot.id, key: TRAIT, value: "5" }] };
    const [a, b] = await Promise.all([saveAs(luis, body), saveAs(luis, body)]);
    expect(a).toEqual(b);
    expect(a.saved).toBe(1);
    expect(await historyCount(plot.id)).toBe(0);
  });

  it("a save id already used for another site is refused, not answered with that site's result", async () => {
    const clientSaveId = crypto.randomUUID();
    await saveAs(rosa, { clientSaveId, values: [{ plotId: site.plots[3]!.id, key: TRAIT, value: "2" }] });
    const e = await refusal(saveObservationsForViewer(rosa, { trialId: cedar.trialId, siteId: cedar.siteId, clientSaveId, values: [{ plotId: cedar.plots[1]!.id, key: TRAIT, value: "5" }] }));
    expect(e.message).toBe("This save was already sent for another site.");
    expect(e.status).toBe(400);
  });

  it("a save repeated after the site was sent for review answers what it answered then, while a new save is refused as locked", async () => {
    const plot = site.plots[8]!;
    const body = { clientSaveId: crypto.randomUUID(), values: [{ plotId: plot.id, key: TRAIT, value: "7" }] };
    const first = await saveAs(luis, body);
    await db.update(s.submissions).set({ status: "submitted" }).where(eq(s.submissions.enrolmentId, site.enrolmentId));
    try {
      expect(await saveAs(luis, body)).toEqual(first);
      const e = await refusal(saveAs(luis, { clientSaveId: crypto.randomUUID(), values: [{ plotId: plot.id, key: TRAIT, value: "8" }] }));
      expect(e.message).toMatch(/sent this site's data for review/);
      expect((await storedNote(plot.id))!.valueNumber).toBe(7);
    } finally {
      await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, site.enrolmentId));
    }
  });

  it("a save with a phone id for another grower's site is refused as unknown and leaves no answer behind", async () => {
    const clientSaveId = crypto.randomUUID();
    const e = await refusal(saveObservationsForViewer(mei, { trialId: site.trialId, siteId: site.siteId, clientSaveId, values: [{ plotId: site.plots[9]!.id, key: TRAIT, value: "2" }] }));
    expect(e.code).toBe("not_found");
    expect(await storedNote(site.plots[9]!.id)).toBeNull();
    expect(await db.select().from(s.clientSaves).where(and(eq(s.clientSaves.userId, mei.id), eq(s.clientSaves.clientSaveId, clientSaveId)))).toHaveLength(0);
  });

  it("a save id that is not a UUID is refused", async () => {
    const e = await refusal(saveAs(luis, { clientSaveId: "1' OR 1=1", values: [{ plotId: site.plots[7]!.id, key: TRAIT, value: "5" }] }));
    expect(e.message).toBe("That save id is not valid.");
  });
});

describe("a value changed on the server while the phone was offline", () => {
  it("comes back as a conflict with both values and writes nothing, instead of overwriting the coordinator's correction", async () => {
    const plot = site.plots[4]!;
    await saveAs(luis, { values: [{ plotId: plot.id, key: TRAIT, value: "3" }] });
    await saveAs(rosa, { values: [{ plotId: plot.id, key: TRAIT, value: "8" }] });
    const e = await refusal(saveAs(luis, { clientSaveId: crypto.randomUUID(), values: [{ plotId: plot.id, key: TRAIT, value: "5", knownSaved: { value: "3", missingReason: null } }] }));
    expect(e).toBeInstanceOf(StaleValuesError);
    expect(e.status).toBe(409);
    expect((e as StaleValuesError).conflicts).toEqual([{ plotId: plot.id, plotCode: plot.plotCode, key: TRAIT, column: expect.any(String), saved: "8", savedReason: null }]);
    expect((await storedNote(plot.id))!.valueNumber).toBe(8);

    // The grower chose their own value: sent again knowing the coordinator's, it saves.
    const chosen = await saveAs(luis, { clientSaveId: crypto.randomUUID(), values: [{ plotId: plot.id, key: TRAIT, value: "5", knownSaved: { value: "8", missingReason: null } }] });
    expect(chosen.saved).toBe(1);
    expect((await storedNote(plot.id))!.valueNumber).toBe(5);
  });

  it("a reason the coordinator chose meanwhile is a conflict too; the same value typed on both sides is not", async () => {
    const plot = site.plots[5]!;
    await saveAs(rosa, { values: [{ plotId: plot.id, key: TRAIT, value: null, missingReason: "died" }] });
    const e = await refusal(saveAs(luis, { values: [{ plotId: plot.id, key: TRAIT, value: "4", knownSaved: { value: null, missingReason: null } }] }));
    expect((e as StaleValuesError).conflicts[0]).toMatchObject({ saved: "", savedReason: "died" });

    const same = site.plots[6]!;
    await saveAs(rosa, { values: [{ plotId: same.id, key: TRAIT, value: "6" }] });
    const ok = await saveAs(luis, { values: [{ plotId: same.id, key: TRAIT, value: "6", knownSaved: { value: null, missingReason: null } }] });
    expect(ok.saved).toBe(0);
  });
});
