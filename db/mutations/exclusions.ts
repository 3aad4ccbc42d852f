import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "../index";
import { analysisExclusions, enrolments, plots, trialTraits } from "../schema";
import { insertAudit } from "../audit";
import { lockTrialForStaff } from "../access";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import type { ExclusionCategory } from "@/lib/domain/vocabulary/enums";

/**
 * Leaves a site or a plot out of a trial's analyses (all traits, or one) with a public category and the
 * staff's private note. The observations stay untouched; the exclusion is audited in the same transaction.
 */
export async function insertExclusion(
  viewer: Viewer,
  request: { trialId: number; siteId: number | null; plotId: number | null; plotCode?: string | null; traitId: number | null; category: ExclusionCategory; note: string | null },
): Promise<number> {
  const { plotCode = null, ...fields } = request;
  if ([fields.siteId, fields.plotId, plotCode].filter((v) => v !== null).length !== 1) throw new AppError("bad_request", "Exclude either a site or a plot.");
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, fields.trialId);
    const input = { ...fields };
    if (plotCode !== null) {
      const [plot] = await tx.select({ id: plots.id }).from(plots).where(and(eq(plots.trialId, trial.id), eq(plots.plotCode, plotCode)));
      if (!plot) {
        const message = `There is no plot ${plotCode} in this trial. Check the code on the plot's label or the field sheet.`;
        throw new AppError("not_found", message, { plotCode: [message] });
      }
      input.plotId = plot.id;
    }
    if (input.siteId !== null) {
      const [enrolled] = await tx.select({ id: enrolments.id }).from(enrolments).where(and(eq(enrolments.trialId, trial.id), eq(enrolments.siteId, input.siteId)));
      if (!enrolled) throw new AppError("not_found", "That site is not part of this trial.");
    }
    if (input.plotId !== null) {
      const [plot] = await tx.select({ id: plots.id }).from(plots).where(and(eq(plots.trialId, trial.id), eq(plots.id, input.plotId)));
      if (!plot) throw new AppError("not_found", "That plot is not part of this trial.");
    }
    if (input.traitId !== null) {
      const [recorded] = await tx.select({ id: trialTraits.id }).from(trialTraits).where(and(eq(trialTraits.trialId, trial.id), eq(trialTraits.traitId, input.traitId)));
      if (!recorded) throw new AppError("not_found", "That trait is not recorded in this trial.");
    }
    const existing = await tx
      .select({ id: analysisExclusions.id, siteId: analysisExclusions.siteId, plotId: analysisExclusions.plotId, traitId: analysisExclusions.traitId })
      .from(analysisExclusions)
      .where(eq(analysisExclusions.trialId, trial.id));
    if (existing.some((x) => x.siteId === input.siteId && x.plotId === input.plotId && x.traitId === input.traitId)) {
      throw new AppError("conflict", "That exclusion is already recorded. Include it again first to change its reason.");
    }
    const [row] = await tx
      .insert(analysisExclusions)
      .values({ trialId: trial.id, siteId: input.siteId, plotId: input.plotId, traitId: input.traitId, category: input.category, privateNote: input.note, createdById: viewer.id })
      .$returningId();
    await insertAudit(tx, { actorId: viewer.id, action: "exclude", entity: "analysis_exclusion", entityId: row!.id, trialId: trial.id, newValue: input });
    return row!.id;
  });
}

/** Brings an excluded site or plot back into the analyses; the removed exclusion is kept in the audit log. */
export async function deleteExclusion(viewer: Viewer, input: { trialId: number; exclusionId: number }): Promise<void> {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const [row] = await tx
      .select({ id: analysisExclusions.id, siteId: analysisExclusions.siteId, plotId: analysisExclusions.plotId, traitId: analysisExclusions.traitId, category: analysisExclusions.category, note: analysisExclusions.privateNote })
      .from(analysisExclusions)
      .where(and(eq(analysisExclusions.id, input.exclusionId), eq(analysisExclusions.trialId, trial.id)));
    if (!row) throw new AppError("not_found", "That exclusion no longer exists.");
    await tx.delete(analysisExclusions).where(eq(analysisExclusions.id, row.id));
    await insertAudit(tx, { actorId: viewer.id, action: "include_again", entity: "analysis_exclusion", entityId: row.id, trialId: trial.id, oldValue: row });
  });
}

/** Shows or hides one site's own analysis to its cooperators; audited. Other sites stay hidden from them. */
export async function updateResultsShared(viewer: Viewer, input: { trialId: number; siteId: number; shared: boolean }): Promise<void> {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const [enrolment] = await tx
      .select({ id: enrolments.id, shared: enrolments.resultsShared })
      .from(enrolments)
      .where(and(eq(enrolments.trialId, trial.id), eq(enrolments.siteId, input.siteId)));
    if (!enrolment) throw new AppError("not_found", "That site is not part of this trial.");
    if (enrolment.shared === input.shared) return;
    await tx.update(enrolments).set({ resultsShared: input.shared }).where(eq(enrolments.id, enrolment.id));
    await insertAudit(tx, { actorId: viewer.id, action: input.shared ? "share_results" : "unshare_results", entity: "enrolment", entityId: enrolment.id, trialId: trial.id, oldValue: { shared: enrolment.shared }, newValue: { shared: input.shared } });
  });
}
