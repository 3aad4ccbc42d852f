import "server-only";
import { and, eq, isNull, max } from "drizzle-orm";
import { db } from "../index";
import { publishedReports, trials } from "../schema";
import { lockTrialForStaff } from "../access";
import { insertAudit } from "../audit";
import { insertMail } from "./mail";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import type { PublishedSnapshot } from "@/lib/domain/publish/types";
import type { OutgoingMail } from "@/lib/domain/mail/templates";

/**
 * Stores a new published version: the next version number, the frozen snapshot, the trial marked
 * published, an audit entry and the notices to cooperators, all in one transaction. A correction
 * (version 2 and later) needs a change note.
 */
export async function insertPublishedReport(
  viewer: Viewer,
  p: { trialId: number; traitId: number | null; build: (version: number, publishedAt: Date) => Promise<PublishedSnapshot>; changeNote: string | null; notices: (snapshot: PublishedSnapshot) => OutgoingMail[] },
) {
  // The analysis runs before the transaction so the row locks are held only for the short write.
  const [current] = await db.select({ latest: max(publishedReports.version) }).from(publishedReports).where(eq(publishedReports.trialId, p.trialId));
  const version = (current?.latest ?? 0) + 1;
  if (version > 1 && !p.changeNote) {
    throw new AppError("bad_request", "Say what changed since the last version.", { changeNote: ["A correction needs a change note."] });
  }
  const publishedAt = new Date(Math.floor(Date.now() / 1000) * 1000);
  const snapshot = await p.build(version, publishedAt);
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, p.trialId);
    if (trial.status === "draft" || trial.status === "archived") {
      throw new AppError("conflict", `A ${trial.status} trial cannot be published.`);
    }
    const [again] = await tx.select({ latest: max(publishedReports.version) }).from(publishedReports).where(eq(publishedReports.trialId, p.trialId));
    if ((again?.latest ?? 0) + 1 !== version) throw new AppError("conflict", "Someone published this trial at the same moment. Reload and try again.");
    const [row] = await tx
      .insert(publishedReports)
      .values({
        trialId: p.trialId,
        version,
        traitId: p.traitId,
        settings: snapshot.settings,
        snapshot: JSON.stringify(snapshot),
        changeNote: p.changeNote,
        publishedById: viewer.id,
        publishedAt,
      })
      .$returningId();
    await tx.update(trials).set({ status: "published" }).where(eq(trials.id, p.trialId));
    await insertAudit(tx, { actorId: viewer.id, action: "publish", entity: "trial", entityId: p.trialId, trialId: p.trialId, oldValue: { status: trial.status }, newValue: { version, traitId: p.traitId } });
    for (const mail of p.notices(snapshot)) await insertMail(tx, mail);
    return { id: row!.id, version };
  });
}

/** Withdraws every live version of a trial, keeping them for the record and showing the reason publicly. */
export async function updateUnpublished(viewer: Viewer, p: { trialId: number; reason: string }) {
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, p.trialId);
    const live = await tx
      .select({ id: publishedReports.id })
      .from(publishedReports)
      .where(and(eq(publishedReports.trialId, p.trialId), isNull(publishedReports.unpublishedAt)));
    if (live.length === 0) throw new AppError("conflict", "This trial has no published results to withdraw.");
    await tx
      .update(publishedReports)
      .set({ unpublishedAt: new Date(), unpublishReason: p.reason })
      .where(and(eq(publishedReports.trialId, p.trialId), isNull(publishedReports.unpublishedAt)));
    await tx.update(trials).set({ status: "analysing" }).where(eq(trials.id, p.trialId));
    await insertAudit(tx, { actorId: viewer.id, action: "unpublish", entity: "trial", entityId: p.trialId, trialId: p.trialId, oldValue: { status: trial.status }, newValue: { reason: p.reason } });
  });
}
