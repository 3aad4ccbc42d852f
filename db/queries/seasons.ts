import "server-only";
import { asc, count, desc, eq } from "drizzle-orm";
import { db } from "../index";
import { programs, seasons, trials } from "../schema";
import { programScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

/** Seasons of the viewer's programs (every program's for admins), newest first, with their trial counts; staff only. */
export async function listSeasonsForStaff(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  const rows = await db
    .select({
      id: seasons.id,
      programId: seasons.programId,
      program: programs.name,
      name: seasons.name,
      year: seasons.year,
      startsOn: seasons.startsOn,
      endsOn: seasons.endsOn,
      closedAt: seasons.closedAt,
      trials: count(trials.id),
    })
    .from(seasons)
    .innerJoin(programs, eq(programs.id, seasons.programId))
    .leftJoin(trials, eq(trials.seasonId, seasons.id))
    .where(programScope(viewer, seasons.programId))
    .groupBy(seasons.id, programs.name)
    .orderBy(desc(seasons.year), asc(programs.name), asc(seasons.name));
  return rows.map(({ closedAt, ...r }) => ({ ...r, closed: closedAt !== null, closedOn: closedAt ? closedAt.toISOString().slice(0, 10) : null }));
}
export type SeasonListRow = Awaited<ReturnType<typeof listSeasonsForStaff>>[number];
