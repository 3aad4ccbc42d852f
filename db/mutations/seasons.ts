import "server-only";
import { and, eq } from "drizzle-orm";
import type { Tx } from "../index";
import { seasons } from "../schema";
import { insertAudit } from "../audit";
import { isDuplicateKey, programScope, requireStaff } from "../access";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";

/** A season's editable fields, as stored. */
export interface SeasonRow {
  name: string;
  year: number;
  startsOn?: string;
  endsOn?: string;
}

export interface LockedSeason {
  id: number;
  programId: number;
  name: string;
  year: number;
  startsOn: string | null;
  endsOn: string | null;
  closedAt: Date | null;
}

const duplicateName = () => new AppError("conflict", "This program already has a season with this name.", { name: ["This program already has a season with this name."] });

/**
 * A season of one of the viewer's programs, locked for the rest of the transaction so closing it and adding
 * a trial to it are serialised. An unknown season and another program's season get the same answer.
 */
export async function lockSeasonForStaff(tx: Tx, viewer: Viewer, seasonId: number): Promise<LockedSeason> {
  requireStaff(viewer);
  const [season] = await tx
    .select({ id: seasons.id, programId: seasons.programId, name: seasons.name, year: seasons.year, startsOn: seasons.startsOn, endsOn: seasons.endsOn, closedAt: seasons.closedAt })
    .from(seasons)
    .where(and(eq(seasons.id, seasonId), programScope(viewer, seasons.programId)))
    .for("update");
  if (!season) throw new AppError("not_found", "That season does not exist or is not in your programs.");
  return season;
}

/** Inserts a season in a program the caller resolved for the viewer, with an audit entry. */
export async function insertSeason(tx: Tx, p: { viewer: Viewer; programId: number; season: SeasonRow }): Promise<number> {
  let seasonId: number;
  try {
    const [row] = await tx
      .insert(seasons)
      .values({ programId: p.programId, name: p.season.name, year: p.season.year, startsOn: p.season.startsOn ?? null, endsOn: p.season.endsOn ?? null })
      .$returningId();
    seasonId = row!.id;
  } catch (e) {
    if (isDuplicateKey(e)) throw duplicateName();
    throw e;
  }
  await insertAudit(tx, { actorId: p.viewer.id, action: "create", entity: "season", entityId: seasonId, newValue: { programId: p.programId, ...p.season } });
  return seasonId;
}

/** Stores a locked season's edited name, year and dates, with an audit entry. */
export async function updateSeason(tx: Tx, p: { viewer: Viewer; season: LockedSeason; changes: SeasonRow }) {
  try {
    await tx
      .update(seasons)
      .set({ name: p.changes.name, year: p.changes.year, startsOn: p.changes.startsOn ?? null, endsOn: p.changes.endsOn ?? null })
      .where(eq(seasons.id, p.season.id));
  } catch (e) {
    if (isDuplicateKey(e)) throw duplicateName();
    throw e;
  }
  await insertAudit(tx, { actorId: p.viewer.id, action: "update", entity: "season", entityId: p.season.id, oldValue: p.season, newValue: p.changes });
}

/** Closes a locked season (or opens it again), with an audit entry. */
export async function updateSeasonClosed(tx: Tx, p: { viewer: Viewer; season: LockedSeason; closedAt: Date | null }) {
  await tx.update(seasons).set({ closedAt: p.closedAt }).where(eq(seasons.id, p.season.id));
  await insertAudit(tx, {
    actorId: p.viewer.id,
    action: p.closedAt ? "close" : "reopen",
    entity: "season",
    entityId: p.season.id,
    oldValue: { closedAt: p.season.closedAt },
    newValue: { closedAt: p.closedAt },
  });
}
