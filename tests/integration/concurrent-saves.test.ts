import { afterAll, beforeAll, describe, expect, it } from "vitest";
import mysql from "mysql2/promise";
import { and, eq, inArray } from "drizzle-orm";
import { testDatabase, unique } from "../helpers/db";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { addDays, todayIso } from "@/lib/domain/schedule";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

// Saves at the same moment, on a trial of this file's own program (two sites, a grower each), so other test files'
// saves never hold the locks these tests look at. A second connection plays "everyone else".

const url = process.env.TEST_DATABASE_URL ?? process.env.DATABASE_URL!;
const { db, pool } = testDatabase();
let other: mysql.Connection;
let trialId: number;
let traitId: number;
const sites: { siteId: number; enrolmentId: number; grower: Viewer; plotIds: number[] }[] = [];
let coordinator: Viewer;
/** A second grower of the first site, attached to it (site_cooperators) rather than named on the enrolment. */
let attachedGrower: Viewer;

beforeAll(async () => {
  other = await mysql.createConnection(url);
  const tag = unique("concurrent");
  // A program of its own, so no demo program's lists gain these sites and varieties.
  const [program] = await db.insert(s.programs).values({ slug: tag.toLowerCase(), name: `Concurrent ${tag}` }).$returningId();
  const [season] = await db.insert(s.seasons).values({ programId: program!.id, name: "Concurrent season", year: 2026 }).$returningId();
  const [crop] = await db.insert(s.crops).values({ name: `Crop ${tag}`, cropGroup: "leafy_greens" }).$returningId();
  const [trial] = await db
    .insert(s.trials)
    .values({ programId: program!.id, seasonId: season!.id, cropId: crop!.id, code: tag.slice(0, 30).toUpperCase(), title: `Concurrent saves ${tag}`, blocks: 1, plotUnit: "bed_row", plotSize: 20, status: "collecting" })
    .$returningId();
  trialId = trial!.id;
  const [trait] = await db.select({ id: s.traits.id }).from(s.traits).where(eq(s.traits.code, "marketable_yield"));
  traitId = trait!.id;
  await db.insert(s.trialTraits).values({ trialId, traitId, sortOrder: 0 });
  const coordinatorEmail = `${tag}-coordinator@example.test`;
  const [staff] = await db.insert(s.users).values({ email: coordinatorEmail, name: "Coordinator", role: "coordinator" }).$returningId();
  await db.insert(s.programCoordinators).values({ programId: program!.id, userId: staff!.id });
  coordinator = { id: staff!.id, email: coordinatorEmail, name: "Coordinator", role: "coordinator" };
  const attachedEmail = `${tag}-attached@example.test`;
  const [attached] = await db.insert(s.users).values({ email: attachedEmail, name: "Attached grower", role: "cooperator" }).$returningId();
  attachedGrower = { id: attached!.id, email: attachedEmail, name: "Attached grower", role: "cooperator" };
  const [variety] = await db.insert(s.varieties).values({ programId: program!.id, cropId: crop!.id, name: `Variety ${tag}` }).$returningId();
  const [entry] = await db.insert(s.trialEntries).values({ trialId, varietyId: variety!.id, blindCode: "C1", entryNumber: 1 }).$returningId();
  for (const n of [1, 2]) {
    const email = `${tag}-${n}@example.test`;
    const [user] = await db.insert(s.users).values({ email, name: `Grower ${n}`, role: "cooperator" }).$returningId();
    const [site] = await db.insert(s.sites).values({ programId: program!.id, name: `Site ${tag} ${n}`, kind: "farm", region: "Valley", growingSetup: "field" }).$returningId();
    const [enrolment] = await db.insert(s.enrolments).values({ trialId, siteId: site!.id, cooperatorId: user!.id, sownOn: addDays(todayIso(), -30), randomisedAt: new Date() }).$returningId();
    await db.insert(s.plots).values([1, 2].map((position) => ({ enrolmentId: enrolment!.id, trialId, siteId: site!.id, entryId: entry!.id, plotCode: `Q${n}${position}${tag.slice(-4)}`, block: 1, position })));
    const plotRows = await db.select({ id: s.plots.id }).from(s.plots).where(eq(s.plots.enrolmentId, enrolment!.id)).orderBy(s.plots.position);
    sites.push({ siteId: site!.id, enrolmentId: enrolment!.id, grower: { id: user!.id, email, name: `Grower ${n}`, role: "cooperator" }, plotIds: plotRows.map((p) => p.id) });
    if (n === 1) await db.insert(s.siteCooperators).values({ siteId: site!.id, userId: attachedGrower.id });
  }
});

afterAll(async () => {
  await other.end();
  await pool.end();
});

const save = (site: (typeof sites)[number], plotId: number, value: string) =>
  saveObservationsForViewer(site.grower, { trialId, siteId: site.siteId, values: [{ plotId, key: "marketable_yield", value }] });

/** Whether `other` can take the lock at once; NOWAIT answers an error instead of waiting for it. */
async function canLock(query: string, params: unknown[]): Promise<boolean> {
  await other.query("BEGIN");
  try {
    await other.query(`${query} NOWAIT`, params);
    return true;
  } catch (e) {
    if ((e as { errno?: number }).errno !== 1205) throw e;
    return false;
  } finally {
    await other.query("ROLLBACK");
  }
}

/**
 * Starts a save at `site` and holds it inside its transaction, after it took its locks: a third connection
 * locks the plot row the new value refers to, so the save waits at its insert. Resolves once the save holds
 * the site's enrolment lock; `release` lets it finish.
 */
async function saveHeldMidway(site: (typeof sites)[number], plotId: number, value: string) {
  const holder = await mysql.createConnection(url);
  await holder.query("BEGIN");
  await holder.query("SELECT id FROM plots WHERE id = ? FOR UPDATE", [plotId]);
  const saving = save(site, plotId, value);
  saving.catch(() => undefined);
  while (await canLock("SELECT id FROM enrolments WHERE id = ? FOR UPDATE", [site.enrolmentId])) await new Promise((r) => setTimeout(r, 20));
  return {
    saving,
    release: async () => {
      await holder.query("ROLLBACK");
      await holder.end();
    },
  };
}

describe("saves at the same moment", () => {
  it("a save in progress at one site lets saves at the trial's other sites run, and still holds off a change of the trial's status", async () => {
    const [first, second] = sites as [(typeof sites)[number], (typeof sites)[number]];
    const held = await saveHeldMidway(first, first.plotIds[0]!, "1200");
    try {
      // What another site's save takes first: the trial row for reading. Before, a save locked it for writing.
      expect(await canLock("SELECT id FROM trials WHERE id = ? LOCK IN SHARE MODE", [trialId])).toBe(true);
      // Publishing or a status change locks the trial for writing: it still waits for the save in progress.
      expect(await canLock("SELECT id FROM trials WHERE id = ? FOR UPDATE", [trialId])).toBe(false);
      // The site itself stays locked, so a second phone's save at the same site waits its turn.
      expect(await canLock("SELECT id FROM enrolments WHERE id = ? FOR UPDATE", [first.enrolmentId])).toBe(false);
      const other = await save(second, second.plotIds[0]!, "1300");
      expect(other.saved).toBe(1);
    } finally {
      await held.release();
    }
    expect((await held.saving).saved).toBe(1);
  });

  it("two saves of the same plot at once store one value, the earlier one kept in history and both audited", async () => {
    const site = sites[1]!;
    const plotId = site.plotIds[1]!;
    const results = await Promise.all([save(site, plotId, "2100"), save(site, plotId, "2200")]);
    expect(results.map((r) => r.saved)).toEqual([1, 1]);
    const rows = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plotId), eq(s.observations.traitId, traitId)));
    expect(rows).toHaveLength(1);
    const history = await db.select().from(s.observationHistory).where(eq(s.observationHistory.observationId, rows[0]!.id));
    expect(history).toHaveLength(1);
    // Whichever ran second replaced the first one's value, which went to history.
    expect([rows[0]!.valueNumber, history[0]!.valueNumber].sort()).toEqual([2100, 2200]);
    const audit = await db.select({ action: s.auditLog.action }).from(s.auditLog).where(and(eq(s.auditLog.entity, "observation"), eq(s.auditLog.entityId, String(rows[0]!.id))));
    expect(audit.map((a) => a.action).sort()).toEqual(["observation.change", "observation.record"]);
    const [submission] = await db.select({ status: s.submissions.status }).from(s.submissions).where(inArray(s.submissions.enrolmentId, [site.enrolmentId]));
    expect(submission?.status).toBe("draft");
  });

  it.each(["named", "attached"] as const)("a save by the site's %s grower waiting for its site behind a send for review is refused once that commits, not written from an older snapshot", async (which) => {
    const site = sites[0]!;
    const grower = which === "named" ? site.grower : attachedGrower;
    const [submission] = await db.select({ status: s.submissions.status }).from(s.submissions).where(eq(s.submissions.enrolmentId, site.enrolmentId));
    const sender = await mysql.createConnection(url);
    try {
      // Another request holds the site's row and sends its data set for review.
      await sender.query("BEGIN");
      await sender.query("SELECT id FROM enrolments WHERE id = ? FOR UPDATE", [site.enrolmentId]);
      await sender.query("INSERT INTO submissions (enrolment_id, status) VALUES (?, 'submitted') ON DUPLICATE KEY UPDATE status = 'submitted'", [site.enrolmentId]);
      const saving = saveObservationsForViewer(grower, { trialId, siteId: site.siteId, values: [{ plotId: site.plotIds[0]!, key: "marketable_yield", value: "1250" }] });
      saving.catch(() => undefined);
      // The save has read the trial (its share lock is held) and now waits for the site's row.
      while (await canLock("SELECT id FROM trials WHERE id = ? FOR UPDATE", [trialId])) await new Promise((r) => setTimeout(r, 20));
      await sender.query("COMMIT");
      await expect(saving).rejects.toThrow(translatorFor("en")("forms.submittedLocked"));
      const [row] = await db.select({ value: s.observations.valueNumber }).from(s.observations).where(and(eq(s.observations.plotId, site.plotIds[0]!), eq(s.observations.traitId, traitId)));
      expect(row?.value).not.toBe(1250);
    } finally {
      await sender.query("ROLLBACK").catch(() => undefined);
      await sender.end();
      await db.update(s.submissions).set({ status: submission?.status ?? "draft" }).where(eq(s.submissions.enrolmentId, site.enrolmentId));
    }
  });

  it("a save waiting behind a change of its trial's status has not taken its site yet: the trial comes first, as status changes take them", async () => {
    const site = sites[1]!;
    const changer = await mysql.createConnection(url);
    try {
      // A status change holds the trial for writing (and would lock the trial's sites after it).
      await changer.query("BEGIN");
      await changer.query("SELECT id FROM trials WHERE id = ? FOR UPDATE", [trialId]);
      const saving = save(site, site.plotIds[0]!, "1400");
      saving.catch(() => undefined);
      // The save's read of the trial is now waiting for that lock (this account's own statements are visible to it).
      const waiting = async () => {
        const [rows] = await other.query("SELECT COUNT(*) AS n FROM information_schema.PROCESSLIST WHERE INFO LIKE '%LOCK IN SHARE MODE%' AND ID <> CONNECTION_ID()");
        return Number((rows as { n: number }[])[0]!.n) > 0;
      };
      while (!(await waiting())) await new Promise((r) => setTimeout(r, 20));
      expect(await canLock("SELECT id FROM enrolments WHERE id = ? FOR UPDATE", [site.enrolmentId])).toBe(true);
      await changer.query("COMMIT");
      expect((await saving).saved).toBe(1);
    } finally {
      await changer.query("ROLLBACK").catch(() => undefined);
      await changer.end();
    }
  });

  it("a coordinator's save waiting for the site behind a grower's save sees the grower's value, and keeps it in history", async () => {
    const site = sites[0]!;
    const plotId = site.plotIds[1]!;
    const [before] = await db.select({ id: s.observations.id }).from(s.observations).where(and(eq(s.observations.plotId, plotId), eq(s.observations.traitId, traitId)));
    expect(before).toBeUndefined();
    const held = await saveHeldMidway(site, plotId, "3100");
    const correcting = saveObservationsForViewer(coordinator, { trialId, siteId: site.siteId, values: [{ plotId, key: "marketable_yield", value: "3200" }] });
    correcting.catch(() => undefined);
    try {
      // The coordinator's save has checked nothing yet: it waits for the site's row, which the grower's save holds.
      const waiting = async () => {
        const [rows] = await other.query("SELECT COUNT(*) AS n FROM information_schema.PROCESSLIST WHERE INFO LIKE '%FOR UPDATE%' AND INFO LIKE '%enrolments%' AND ID <> CONNECTION_ID()");
        return Number((rows as { n: number }[])[0]!.n) > 0;
      };
      while (!(await waiting())) await new Promise((r) => setTimeout(r, 20));
    } finally {
      await held.release();
    }
    expect((await held.saving).saved).toBe(1);
    expect((await correcting).counts).toEqual({ new: 0, changed: 1, unchanged: 0 });
    const rows = await db.select().from(s.observations).where(and(eq(s.observations.plotId, plotId), eq(s.observations.traitId, traitId)));
    expect(rows.map((r) => r.valueNumber)).toEqual([3200]);
    const history = await db.select().from(s.observationHistory).where(eq(s.observationHistory.observationId, rows[0]!.id));
    expect(history.map((h) => h.valueNumber)).toEqual([3100]);
  });
});
