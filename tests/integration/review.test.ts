import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, desc, eq, gt } from "drizzle-orm";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { saveObservationsForViewer } from "@/server/observations/recording";
import { insertReviewComment, updateSubmissionAccepted, updateSubmissionReturned, updateSubmissionSubmitted } from "@/server/review/submissions";
import { insertDueReminders } from "@/server/review/reminders";
import { getSubmissionState } from "@/db/queries/review";
import { getReviewSheet, listReviewQueue } from "@/server/review/sheets";
import { flagValues } from "@/lib/domain/observations/flags";
import { entryColumns } from "@/lib/domain/observations/columns";

const { db, pool } = testDatabase();
const links = { appUrl: "http://seedplot.test" };
let kwame: Viewer;
let tomas: Viewer;
let rosa: Viewer;
let stones: Awaited<ReturnType<typeof demoSite>>;
let fernbrook: Awaited<ReturnType<typeof demoSite>>;
let mailMark = 0;

async function mailsSince(to: string) {
  return db.select({ subject: s.mailOutbox.subject, text: s.mailOutbox.textBody }).from(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), eq(s.mailOutbox.toAddress, to)));
}
async function auditFor(submissionId: number) {
  return db.select({ action: s.auditLog.action, actorId: s.auditLog.actorId, oldValue: s.auditLog.oldValue, newValue: s.auditLog.newValue }).from(s.auditLog).where(and(eq(s.auditLog.entity, "submission"), eq(s.auditLog.entityId, String(submissionId)))).orderBy(s.auditLog.id);
}

beforeAll(async () => {
  [kwame, tomas, rosa] = await Promise.all([demoViewer(db, "kwame@threestones.example"), demoViewer(db, "tomas@willowbend.example"), demoViewer(db, "rosa.delgado@tamarack-valley.example")]);
  stones = await demoSite(db, "TV27-KAL", "Three Stones Farm");
  fernbrook = await demoSite(db, "TV27-KAL", "Fernbrook School Garden");
  await db.update(s.submissions).set({ status: "draft" }).where(eq(s.submissions.enrolmentId, stones.enrolmentId));
  await db.delete(s.auditLog).where(and(eq(s.auditLog.action, "reminder.sent"), eq(s.auditLog.entityId, String(fernbrook.enrolmentId))));
  const [last] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = last?.id ?? 0;
});

afterAll(async () => {
  await pool.end();
});

describe("review of a site's data", () => {
  it("draft -> submitted by the grower, with an e-mail to the coordinator and an audit entry", async () => {
    await expect(updateSubmissionSubmitted(tomas, stones, links)).rejects.toMatchObject({ code: "not_found" });
    await updateSubmissionSubmitted(kwame, stones, links);
    const state = await getSubmissionState(kwame, stones);
    expect(state).toMatchObject({ status: "submitted" });
    expect(await getSubmissionState(tomas, stones)).toBeNull();
    const mail = await mailsSince("rosa.delgado@tamarack-valley.example");
    expect(mail.some((m) => m.subject === "Data received: Three Stones Farm, Baby-leaf kale in trays under lights" && m.text.includes(`/portal/review/${stones.trialId}/${stones.siteId}`))).toBe(true);
    // Locked for the grower now.
    await expect(saveObservationsForViewer(kwame, { trialId: stones.trialId, siteId: stones.siteId, values: [{ plotId: stones.plots[0]!.id, key: "quality", value: "5" }] })).rejects.toMatchObject({ code: "conflict" });
    await expect(updateSubmissionSubmitted(kwame, stones, links)).rejects.toMatchObject({ code: "conflict" });
  });

  it("shows staff completeness, late counts and flags; growers get no review queue", async () => {
    expect(await listReviewQueue(kwame)).toEqual([]);
    expect(await getReviewSheet(kwame, stones)).toBeNull();
    const queue = await listReviewQueue(rosa);
    const row = queue.find((q) => q.siteId === stones.siteId && q.trialId === stones.trialId)!;
    expect(row.status).toBe("submitted");
    expect(row.expected).toBeGreaterThan(0);
    expect(row.recorded).toBeLessThanOrEqual(row.expected);
    expect(queue.some((q) => q.siteName === "Fernbrook School Garden" && q.late > 0)).toBe(true);
    const sheet = await getReviewSheet(rosa, stones);
    expect(sheet!.completeness.expected).toBe(row.expected);
  });

  it("returned with a comment on one value: the grower is e-mailed the comment and may edit again", async () => {
    const plot = stones.plots[1]!;
    await expect(updateSubmissionReturned(rosa, stones, links)).rejects.toMatchObject({ code: "bad_request" });
    await expect(insertReviewComment(kwame, { ...stones, plotId: plot.id, key: "emergence_count@5", body: "x" })).rejects.toMatchObject({ code: "forbidden" });
    await expect(insertReviewComment(rosa, { ...stones, plotId: fernbrook.plots[0]!.id, body: "x" })).rejects.toMatchObject({ code: "not_found" });
    await insertReviewComment(rosa, { ...stones, plotId: plot.id, key: "emergence_count@5", body: "Day 5 count looks high; please recount." });
    await updateSubmissionReturned(rosa, { ...stones, message: "One value to check." }, links);
    const mail = await mailsSince("kwame@threestones.example");
    const returned = mail.find((m) => m.subject.startsWith("Please check your data"));
    expect(returned?.text).toContain(`Plot ${plot.plotCode}: Day 5 count looks high; please recount.`);
    expect((await getSubmissionState(kwame, stones))!.openComments).toBe(1);
    const sheet = await getReviewSheet(rosa, stones);
    expect(sheet!.comments[0]).toMatchObject({ plotId: plot.id, body: "Day 5 count looks high; please recount." });
    expect(sheet!.comments[0]!.observationId).not.toBeNull();
    await saveObservationsForViewer(kwame, { trialId: stones.trialId, siteId: stones.siteId, values: [{ plotId: plot.id, key: "emergence_count@5", value: "2" }] });
  });

  it("resubmitted and accepted, each step audited with old and new status, and the grower told", async () => {
    await expect(updateSubmissionAccepted(kwame, stones, links)).rejects.toMatchObject({ code: "forbidden" });
    await updateSubmissionSubmitted(kwame, stones, links);
    expect((await getSubmissionState(kwame, stones))!.openComments).toBe(0);
    await updateSubmissionAccepted(rosa, stones, links);
    await expect(updateSubmissionReturned(rosa, { ...stones, message: "late thought" }, links)).rejects.toMatchObject({ code: "conflict" });
    const [sub] = await db.select({ id: s.submissions.id }).from(s.submissions).where(eq(s.submissions.enrolmentId, stones.enrolmentId));
    const trail = await auditFor(sub!.id);
    expect(trail.map((a) => a.action).slice(-4)).toEqual(["submission.submit", "submission.return", "submission.submit", "submission.accept"]);
    expect(trail.at(-1)).toMatchObject({ actorId: rosa.id, oldValue: { status: "submitted" }, newValue: { status: "accepted" } });
    const mail = await mailsSince("kwame@threestones.example");
    expect(mail.some((m) => m.subject === "Data accepted: Three Stones Farm, Baby-leaf kale in trays under lights")).toBe(true);
  });
});

describe("reminders", () => {
  it("queue one message per grower for overdue counts, once a day", async () => {
    const first = await insertDueReminders({ appUrl: links.appUrl });
    expect(first).toBeGreaterThan(0);
    const mail = await mailsSince("dev@fernbrookschool.example");
    expect(mail).toHaveLength(1);
    expect(mail[0]!.subject).toBe("Overdue counts at Fernbrook School Garden");
    expect(mail[0]!.text).toMatch(/Seedlings emerged \(count\), day \d+ \(due [A-Z][a-z]{2} \d{1,2}, 2026\): \d+ of 18 plots to record/);
    await insertDueReminders({ appUrl: links.appUrl });
    expect(await mailsSince("dev@fernbrookschool.example")).toHaveLength(1);
    // Accepted data is never chased.
    expect((await mailsSince("kwame@threestones.example")).filter((m) => m.subject.includes("Overdue"))).toHaveLength(0);
  });

  it("for counts due tomorrow as well", async () => {
    const [e] = await db.select({ sownOn: s.enrolments.sownOn }).from(s.enrolments).where(eq(s.enrolments.id, fernbrook.enrolmentId));
    const today = new Date(Date.parse(`${e!.sownOn}T00:00:00Z`) + 4 * 86400_000).toISOString().slice(0, 10);
    await insertDueReminders({ appUrl: links.appUrl, today });
    const mail = (await mailsSince("dev@fernbrookschool.example")).at(-1)!;
    expect(mail.text).toMatch(/Due tomorrow:\n- Seedlings emerged \(count\), day 5/);
  });
});

describe("suspicious values", () => {
  it("flags values outside the range and far from the same entry's other plots", () => {
    const columns = entryColumns([{ id: 1, code: "marketable_yield", name: "Yield", unit: "g", valueType: "number", minValue: 0, maxValue: 1000, dueDaysAfterSowing: null, dueNote: null }]);
    const plotsList = ["A", "B", "C"].flatMap((code, e) => [1, 2, 3].map((b) => ({ id: e * 10 + b, blindCode: code, plotCode: `${code}${b}` })));
    const v = (n: number) => ({ valueNumber: n, valueDate: null, valueText: null });
    const values: Record<number, Record<string, ReturnType<typeof v>>> = {
      1: { marketable_yield: v(200) }, 2: { marketable_yield: v(210) }, 3: { marketable_yield: v(20) },
      11: { marketable_yield: v(300) }, 12: { marketable_yield: v(310) }, 13: { marketable_yield: v(305) },
      21: { marketable_yield: v(150) }, 22: { marketable_yield: v(1500) }, 23: { marketable_yield: v(155) },
    };
    const flags = flagValues({ columns, plots: plotsList, values });
    expect(flags.find((f) => f.plotId === 22 && f.kind === "out_of_range")).toBeTruthy();
    expect(flags.find((f) => f.plotId === 3 && f.kind === "far_from_entry")?.message).toMatch(/20 is far from the other plots of code A at this site \(200, 210\)/);
    expect(flags.some((f) => [11, 12, 13].includes(f.plotId))).toBe(false);
  });
});

