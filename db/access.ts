import "server-only";
import { and, count, eq, inArray, not, or, sql, type SQL } from "drizzle-orm";
import { db, type Tx } from "./index";
import type { AnyMySqlColumn } from "drizzle-orm/mysql-core";
import { enrolments, observations, plots, programCoordinators, programs, siteCooperators, sites, trials, varieties } from "./schema";
import type { TrialStatus } from "@/lib/domain/vocabulary/enums";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";

// Ownership rules shared by queries and mutations, applied in SQL so a forgotten check cannot leak rows.
// Programs are tenants: trials, sites, varieties (with their seed lots) and custom traits each belong to one
// program, and a coordinator reaches only the rows of the programs they coordinate. Admins reach everything.

/**
 * Rows whose program `column` is one of the viewer's: every row for admins, their programs' rows for
 * coordinators, none for anyone else.
 */
export function programScope(viewer: Viewer, column: AnyMySqlColumn): SQL {
  if (viewer.role === "admin") return sql`true`;
  if (viewer.role !== "coordinator") return sql`false`;
  return inArray(column, db.select({ id: programCoordinators.programId }).from(programCoordinators).where(eq(programCoordinators.userId, viewer.id)));
}

/**
 * The same rule for hand-written subqueries, where a Drizzle column could render unqualified: whether the
 * aliased `qualifiedColumn` (a constant such as "t.program_id") is one of the viewer's programs.
 */
export function programIdIn(viewer: Viewer, qualifiedColumn: "t.program_id" | "v.program_id"): SQL {
  if (viewer.role === "admin") return sql`true`;
  if (viewer.role !== "coordinator") return sql`false`;
  return sql`${sql.raw(qualifiedColumn)} IN (SELECT pc.program_id FROM program_coordinators pc WHERE pc.user_id = ${viewer.id})`;
}

/** Trials a staff member may manage: every trial for admins, their programs' trials for coordinators. */
export function staffTrialScope(viewer: Viewer): SQL {
  return programScope(viewer, trials.programId);
}

/** Sites a staff member may see and manage, contacts included. */
export function staffSiteScope(viewer: Viewer): SQL {
  return programScope(viewer, sites.programId);
}

/** Varieties (and so their seed lots) a staff member may list, edit and enter in trials. */
export function staffVarietyScope(viewer: Viewer): SQL {
  return programScope(viewer, varieties.programId);
}

/**
 * The program a new site, variety or trait goes to: the one chosen on the form, which must be one of the
 * viewer's, or the viewer's only program when the form offers no choice.
 */
export async function resolveProgram(tx: Tx, viewer: Viewer, programId: number | undefined): Promise<number> {
  requireStaff(viewer);
  const mine = await tx
    .select({ id: programs.id })
    .from(programs)
    .where(and(programScope(viewer, programs.id), programId === undefined ? sql`true` : eq(programs.id, programId)))
    .limit(2);
  if (mine.length === 1) return mine[0]!.id;
  if (programId === undefined && mine.length > 1) throw new AppError("bad_request", "Choose the program.", { programId: ["Choose the program."] });
  const message = programId === undefined ? "You do not coordinate a program yet. Ask an administrator to add you to one." : "Choose one of your programs.";
  throw new AppError("bad_request", message, { programId: [message] });
}

/**
 * Whether trials or varieties of programs other than the viewer's grow this crop. Crops are shared, so a
 * coordinator may rename or delete only a crop no other program uses; admins may always.
 */
export async function cropUsedByOtherPrograms(tx: Tx, viewer: Viewer, cropId: number): Promise<boolean> {
  if (viewer.role === "admin") return false;
  const [trial] = await tx.select({ id: trials.id }).from(trials).where(and(eq(trials.cropId, cropId), not(staffTrialScope(viewer)))).limit(1);
  if (trial) return true;
  const [variety] = await tx.select({ id: varieties.id }).from(varieties).where(and(eq(varieties.cropId, cropId), not(staffVarietyScope(viewer)))).limit(1);
  return !!variety;
}

/**
 * Enrolments a cooperator may see: sites they are attached to, or where they are the named cooperator. Written as
 * one SQL fragment rather than with a query builder subquery: every grower's save and page runs it, and building
 * the subquery cost more than the rest of the statement around it.
 */
export function cooperatorEnrolmentScope(viewer: Viewer): SQL {
  return sql`(${enrolments.cooperatorId} = ${viewer.id} or ${enrolments.siteId} in (select ${siteCooperators.siteId} from ${siteCooperators} where ${siteCooperators.userId} = ${viewer.id}))`;
}

export function requireStaff(viewer: Viewer) {
  if (viewer.role !== "coordinator" && viewer.role !== "admin") throw new AppError("forbidden", "Only coordinators can change the trial set-up.");
}

export interface LockedTrial {
  id: number;
  programId: number;
  cropId: number;
  code: string;
  title: string;
  status: TrialStatus;
  design: "rcbd" | "crd";
  blocks: number;
  plotUnit: "insert" | "cells" | "bed_row";
  plotSize: number;
}

/** Trials a viewer reaches: their programs' trials for staff, trials they grow a site of for cooperators. */
function trialScope(viewer: Viewer): SQL {
  if (viewer.role === "coordinator" || viewer.role === "admin") return staffTrialScope(viewer);
  if (viewer.role !== "cooperator") return sql`false`;
  return inArray(trials.id, db.select({ id: enrolments.trialId }).from(enrolments).where(cooperatorEnrolmentScope(viewer)));
}

/**
 * Loads a trial the viewer reaches and locks its row for the rest of the transaction, so two people
 * changing the same trial at once are serialised. Unknown trials and trials out of reach look the same.
 */
export async function lockTrialForViewer(tx: Tx, viewer: Viewer, trialId: number): Promise<LockedTrial> {
  const [trial] = await tx
    .select({ id: trials.id, programId: trials.programId, cropId: trials.cropId, code: trials.code, title: trials.title, status: trials.status, design: trials.design, blocks: trials.blocks, plotUnit: trials.plotUnit, plotSize: trials.plotSize })
    .from(trials)
    .where(and(eq(trials.id, trialId), trialScope(viewer)))
    .for("update");
  if (!trial) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
  return trial;
}

/** The same lock for changes only staff may make (set-up, publishing, exclusions); growers are refused. */
export async function lockTrialForStaff(tx: Tx, viewer: Viewer, trialId: number): Promise<LockedTrial> {
  requireStaff(viewer);
  return lockTrialForViewer(tx, viewer, trialId);
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
