import "server-only";
import { db } from "@/db/index";
import { lockTrialForStaff } from "@/db/access";
import { insertPublishedReport, updateReportsWithdrawn } from "@/db/mutations/publish";
import { countLiveReports, getLatestReportVersion, listTrialCooperatorEmails } from "@/db/queries/publish";
import { resultsPublishedMail } from "@/lib/domain/mail/templates";
import type { PublishSettings } from "@/lib/domain/publish/types";
import type { Viewer } from "@/lib/domain/viewer";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { buildSnapshot } from "./build";

const NOT_YOURS = "That trial does not exist or is not in your programs.";

/**
 * Publishes a trial (or one trait) as a new immutable version, in three steps: the next version number,
 * the snapshot built from the accepted data, then the version, the trial's new status, the audit entry and
 * the notices to its cooperators stored in one transaction. A correction (version 2 and later) needs a
 * change note. The analysis runs before the transaction so the trial's row lock is held only for the write.
 */
export async function publishResults(
  viewer: Viewer,
  p: { trialId: number; traitId: number | null; settings: PublishSettings; changeNote: string | null },
): Promise<{ id: number; version: number }> {
  const latest = await getLatestReportVersion(viewer, { trialId: p.trialId });
  if (latest === null) throw new AppError("not_found", NOT_YOURS);
  const version = latest + 1;
  if (version > 1 && !p.changeNote) {
    throw new AppError("bad_request", "Say what changed since the last version.", { changeNote: ["A correction needs a change note."] });
  }
  // Whole seconds: the stored timestamp has no fractions, and the snapshot must name the same moment.
  const publishedAt = new Date(Math.floor(Date.now() / 1000) * 1000);
  const snapshot = await buildSnapshot(viewer, { trialId: p.trialId, traitId: p.traitId, settings: p.settings, version, changeNote: p.changeNote, publishedAt });
  const cooperators = await listTrialCooperatorEmails(p.trialId);
  const link = `${env.APP_URL}/results/${snapshot.trial.code}`;
  const mails = cooperators.map((c) => resultsPublishedMail({ to: c.email, name: c.name, trialTitle: snapshot.trial.title, version, link }));

  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, p.trialId);
    if (trial.status === "draft" || trial.status === "archived") {
      throw new AppError("conflict", `A ${trial.status} trial cannot be published.`);
    }
    if ((await getLatestReportVersion(viewer, { trialId: p.trialId, tx })) !== latest) {
      throw new AppError("conflict", "Someone published this trial at the same moment. Reload and try again.");
    }
    const id = await insertPublishedReport(tx, {
      actorId: viewer.id,
      trialId: p.trialId,
      previousStatus: trial.status,
      version,
      traitId: p.traitId,
      settings: p.settings,
      snapshot: JSON.stringify(snapshot),
      changeNote: p.changeNote,
      publishedAt,
      mails,
    });
    return { id, version };
  });
}

/** Withdraws every live version of a trial, keeping them for the record and showing the reason publicly. */
export async function withdrawResults(viewer: Viewer, p: { trialId: number; reason: string }): Promise<void> {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, p.trialId);
    if ((await countLiveReports(viewer, { trialId: p.trialId, tx })) === 0) throw new AppError("conflict", "This trial has no published results to withdraw.");
    await updateReportsWithdrawn(tx, { actorId: viewer.id, trialId: p.trialId, previousStatus: trial.status, reason: p.reason, withdrawnAt: new Date() });
  });
}
