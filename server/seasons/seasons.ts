import "server-only";
import { db } from "@/db/index";
import { resolveProgram } from "@/db/access";
import { insertSeason, lockSeasonForStaff, updateSeason, updateSeasonClosed, type SeasonRow } from "@/db/mutations/seasons";
import type { Viewer } from "@/lib/domain/viewer";

// Seasons belong to one program; coordinators manage their own programs' seasons, admins every program's.
// Each change locks the season (or resolves the program) and writes with its audit entry in one transaction.

/** Adds a season to one of the viewer's programs (the form's choice, or their only program). */
export async function createSeason(viewer: Viewer, input: SeasonRow & { programId?: number }): Promise<number> {
  return db.transaction(async (tx) => {
    const programId = await resolveProgram(tx, viewer, input.programId);
    const { programId: _chosen, ...season } = input;
    return insertSeason(tx, { viewer, programId, season });
  });
}

/** Renames a season or changes its year and dates. */
export async function editSeason(viewer: Viewer, input: SeasonRow & { seasonId: number }) {
  await db.transaction(async (tx) => {
    const season = await lockSeasonForStaff(tx, viewer, input.seasonId);
    const { seasonId: _id, ...changes } = input;
    await updateSeason(tx, { viewer, season, changes });
  });
}

/**
 * Closes a season, after which it takes no new trials (its trials carry on), or opens it again. Closing a
 * closed season keeps its first closing date. Answers the season's name for the message.
 */
export async function setSeasonClosed(viewer: Viewer, input: { seasonId: number; closed: boolean }): Promise<string> {
  return db.transaction(async (tx) => {
    const season = await lockSeasonForStaff(tx, viewer, input.seasonId);
    if ((season.closedAt !== null) !== input.closed) await updateSeasonClosed(tx, { viewer, season, closedAt: input.closed ? new Date() : null });
    return season.name;
  });
}
