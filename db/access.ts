import "server-only";
import { and, count, eq, inArray, or, sql, type SQL } from "drizzle-orm";
import { db, type Tx } from "./index";
import { enrolments, observations, plots, programCoordinators, siteCooperators, trials } from "./schema";
import type { TrialStatus } from "./schema/enums";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/auth/types";

// Ownership rules shared by queries and mutations, applied in SQL so a forgotten check cannot leak rows.

/** Trials a staff member may manage: every trial for admins, their programs' trials for coordinators. */
export function staffTrialScope(viewer: Viewer): SQL {
  if (viewer.role === "admin") return sql`true`;
  if (viewer.role !== "coordinator") return sql`false`;
  return inArray(trials.programId, db.select({ id: programCoordinators.programId }).from(programCoordinators).where(eq(programCoordinators.userId, viewer.id)));
}

/** Enrolments a cooperator may see: sites they are attached to, or where they are the named cooperator. */
export function cooperatorEnrolmentScope(viewer: Viewer): SQL {
  return or(
    eq(enrolments.cooperatorId, viewer.id),
    inArray(enrolments.siteId, db.select({ id: siteCooperators.siteId }).from(siteCooperators).where(eq(siteCooperators.userId, viewer.id))),
  )!;
}

export function requireStaff(viewer: Viewer) {
  if (viewer.role !== "coordinator" && viewer.role !== "admin") throw new AppError("forbidden", "Only coordinators can change the trial set-up.");
}

export interface LockedTrial {
  id: number;
  cropId: number;
  code: string;
  status: TrialStatus;
  design: "rcbd" | "crd";
  blocks: number;
  plotUnit: "insert" | "cells" | "bed_row";
  plotSize: number;
}

/**
 * Loads a trial the viewer manages and locks its row for the rest of the transaction, so two
 * coordinators editing entries or layouts at once are serialised. Unknown and foreign trials look the same.
 */
export async function lockTrialForStaff(tx: Tx, viewer: Viewer, trialId: number): Promise<LockedTrial> {
  requireStaff(viewer);
  const [trial] = await tx
    .select({ id: trials.id, cropId: trials.cropId, code: trials.code, status: trials.status, design: trials.design, blocks: trials.blocks, plotUnit: trials.plotUnit, plotSize: trials.plotSize })
    .from(trials)
    .where(and(eq(trials.id, trialId), staffTrialScope(viewer)))
    .for("update");
  if (!trial) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
  return trial;
}

/** Sites with a layout and observations recorded, the inputs of the status rules. */
export async function trialProgress(tx: Tx | typeof db, trialId: number) {
  const [laidOut] = await tx
    .select({ n: count() })
    .from(enrolments)
    .where(and(eq(enrolments.trialId, trialId), sql`${enrolments.randomisedAt} IS NOT NULL`));
  const [observed] = await tx.select({ n: count() }).from(observations).innerJoin(plots, eq(plots.id, observations.plotId)).where(eq(plots.trialId, trialId));
  return { randomisedSites: laidOut?.n ?? 0, observationCount: observed?.n ?? 0 };
}

/** MariaDB's duplicate-key error, however deeply the driver error is wrapped. */
export function isDuplicateKey(e: unknown): boolean {
  let cur: unknown = e;
  for (let depth = 0; cur && depth < 4; depth += 1) {
    if (typeof cur === "object" && cur !== null && "errno" in cur && (cur as { errno: unknown }).errno === 1062) return true;
    cur = typeof cur === "object" && cur !== null && "cause" in cur ? (cur as { cause: unknown }).cause : null;
  }
  return false;
}
