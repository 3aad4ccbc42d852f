import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { refusal } from "../helpers/refusal";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { getPlotRecordTarget } from "@/db/queries/observations";
import { getRecordingSheet, listRecordableSites } from "@/server/observations/sheet";
import { parseDateText, parseNumberText } from "@/lib/domain/observations/values";

const { db, pool } = testDatabase();
let mei: Viewer;
let tomas: Viewer;
let rosa: Viewer;
let cedar: Awaited<ReturnType<typeof demoSite>>;
let willow: Awaited<ReturnType<typeof demoSite>>;

beforeAll(async () => {
  [mei, tomas, rosa] = await Promise.all([
    demoViewer(db, "mei@cedarhollow.example"),
    demoViewer(db, "tomas@willowbend.example"),
    demoViewer(db, "rosa.delgado@tamarack-valley.example"),
  ]);
  cedar = await demoSite(db, "TV27-KAL", "Cedar Hollow Market Garden");
  willow = await demoSite(db, "TV27-KAL", "Willow Bend Farm");
  // Start from a known state for the harvest-time values this file records.
  const ids = cedar.plots.map((p) => p.id);
  await db.delete(s.observations).where(and(inArray(s.observations.plotId, ids), inArray(s.observations.traitId, [cedar.traitId.quality!, cedar.traitId.marketable_yield!, cedar.traitId.harvest_date!])));
  await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, cedar.enrolmentId));
});

afterAll(async () => {
  await pool.end();
});

const save = (viewer: Viewer, site: { trialId: number; siteId: number }, values: { plotId: number; key: string; value: string | null }[]) =>
  saveObservationsForViewer(viewer, { trialId: site.trialId, siteId: site.siteId, values });

describe("recording observations", () => {
  it("a cooperator sees their own site's sheet in layout order, and not another grower's", async () => {
    const sheet = await getRecordingSheet(mei, cedar);
    expect(sheet).not.toBeNull();
    expect(sheet!.plots.map((p) => p.id)).toEqual(cedar.plots.map((p) => p.id));
    expect(sheet!.columns.map((c) => c.key)).toContain("emergence_count@7");
    expect(JSON.stringify(sheet)).not.toMatch(/Heron Lacinato|Thistledown/);
    expect(await getRecordingSheet(tomas, cedar)).toBeNull();
    expect(await getPlotRecordTarget(tomas, cedar.plots[0]!.id)).toBeNull();
    expect(await getPlotRecordTarget(mei, cedar.plots[0]!.id)).toMatchObject({ trialId: cedar.trialId, siteId: cedar.siteId });
    const mine = await listRecordableSites(mei);
    expect(mine.some((x) => x.siteId === cedar.siteId && x.trialId === cedar.trialId)).toBe(true);
    expect(mine.some((x) => x.siteId === willow.siteId)).toBe(false);
  });

  it("a cooperator of site A cannot write site B, not even by guessing plot ids", async () => {
    const before = await writeCounts(db, cedar.enrolmentId);
    const e = await refusal(save(tomas, cedar, [{ plotId: cedar.plots[0]!.id, key: "quality", value: "5" }]));
    expect(e.code).toBe("not_found");
    // Own site in the request, foreign plot id inside it.
    const e2 = await refusal(save(tomas, willow, [{ plotId: cedar.plots[0]!.id, key: "quality", value: "5" }]));
    expect(e2.message).toMatch(/not one of this site's plots/);
    expect(await writeCounts(db, cedar.enrolmentId)).toEqual(before);
  });

  it("refuses bad values field by field, in plain words, and writes none of them", async () => {
    const before = await writeCounts(db, cedar.enrolmentId);
    const plot = cedar.plots[1]!;
    const cases: [string, string, RegExp][] = [
      ["quality", "12", /Ratings are whole numbers from 1 to 9/],
      ["marketable_yield", "25000", /outside the valid range 0 to 20000 g per plot/],
      ["marketable_yield", "twelve", /"twelve" is not a number/],
      ["harvest_date", "2026-11-01", /is before this site.s sowing date/],
      ["harvest_date", "03/04/2026", /could be 3 April 2026 or 4 March 2026/],
      ["emergence_count@5", "7", /more than the 6 seeds sown/],
    ];
    for (const [key, value, message] of cases) {
      const e = await refusal(save(mei, cedar, [{ plotId: plot.id, key, value }]));
      expect(e.code).toBe("bad_request");
      expect(e.fieldErrors?.[`${plot.id}:${key}`]?.join(" ")).toMatch(message);
    }
    // One bad value in a batch stops the good ones too.
    await refusal(save(mei, cedar, [{ plotId: plot.id, key: "quality", value: "6" }, { plotId: plot.id, key: "quality", value: "0" }]));
    expect(await writeCounts(db, cedar.enrolmentId)).toEqual(before);
  });

  it("saves a new value with an audit entry, and a change keeps the earlier value in history", async () => {
    const plot = cedar.plots[2]!;
    const before = await writeCounts(db, cedar.enrolmentId);
    const first = await save(mei, cedar, [{ plotId: plot.id, key: "quality", value: "7" }]);
    expect(first.counts).toEqual({ new: 1, changed: 0, unchanged: 0 });
    const again = await save(mei, cedar, [{ plotId: plot.id, key: "quality", value: "7" }]);
    expect(again.saved).toBe(0);
    const changed = await save(mei, cedar, [{ plotId: plot.id, key: "quality", value: "5" }, { plotId: plot.id, key: "marketable_yield", value: "182,5" }]);
    expect(changed.counts).toEqual({ new: 1, changed: 1, unchanged: 0 });
    const after = await writeCounts(db, cedar.enrolmentId);
    expect(after.observations - before.observations).toBe(2);
    expect(after.history - before.history).toBe(1);
    expect(after.audit - before.audit).toBe(3);
    const [obs] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plot.id), eq(s.observations.traitId, cedar.traitId.quality!)));
    expect(obs!.valueNumber).toBe(5);
    const hist = await db.select().from(s.observationHistory).where(eq(s.observationHistory.observationId, obs!.id));
    expect(hist.map((h) => h.valueNumber)).toEqual([7]);
    const audit = await db.select().from(s.auditLog).where(and(eq(s.auditLog.entity, "observation"), eq(s.auditLog.entityId, String(obs!.id))));
    expect(audit.at(-1)).toMatchObject({ actorId: mei.id, action: "observation.change", oldValue: { value: "7" }, newValue: { value: "5" } });
    const [yieldObs] = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plot.id), eq(s.observations.traitId, cedar.traitId.marketable_yield!)));
    expect(yieldObs!.valueNumber).toBe(182.5);
  });

  it("staff of the program may record for any of its sites", async () => {
    const res = await save(rosa, cedar, [{ plotId: cedar.plots[3]!.id, key: "quality", value: "4" }]);
    expect(res.saved).toBe(1);
  });

  it("locks a cooperator's data once it is sent for review", async () => {
    await db.update(s.submissions).set({ status: "submitted" }).where(eq(s.submissions.enrolmentId, cedar.enrolmentId));
    try {
      const e = await refusal(save(mei, cedar, [{ plotId: cedar.plots[4]!.id, key: "quality", value: "4" }]));
      expect(e.code).toBe("conflict");
      expect(e.message).toMatch(/sent this site's data for review/);
    } finally {
      await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, cedar.enrolmentId));
    }
  });

  it("rejects malformed requests before touching the database", async () => {
    const e = await refusal(saveObservationsForViewer(mei, { trialId: "x", siteId: cedar.siteId, values: [] }));
    expect(e.code).toBe("bad_request");
  });
});

describe("reading what growers type", () => {
  it("accepts unambiguous dates and asks about ambiguous ones", () => {
    expect(parseDateText("2026-04-03")).toEqual({ ok: true, iso: "2026-04-03" });
    expect(parseDateText("25/12/2026")).toEqual({ ok: true, iso: "2026-12-25" });
    expect(parseDateText("12/25/2026")).toEqual({ ok: true, iso: "2026-12-25" });
    expect(parseDateText("4 Mar 2026")).toEqual({ ok: true, iso: "2026-03-04" });
    expect(parseDateText("March 4, 2026")).toEqual({ ok: true, iso: "2026-03-04" });
    expect(parseDateText("05/05/2026")).toEqual({ ok: true, iso: "2026-05-05" });
    expect(parseDateText("03/04/2026").ok).toBe(false);
    expect(parseDateText("3/4/26").ok).toBe(false);
    expect(parseDateText("2026-02-30").ok).toBe(false);
  });
  it("accepts decimal commas unless they could be thousands separators", () => {
    expect(parseNumberText("12,5")).toEqual({ ok: true, n: 12.5 });
    expect(parseNumberText(" 40 ")).toEqual({ ok: true, n: 40 });
    expect(parseNumberText("1,250").ok).toBe(false);
    expect(parseNumberText("12 seeds").ok).toBe(false);
  });
});
