import "server-only";
import { and, asc, desc, eq, inArray, ne, notInArray, sql } from "drizzle-orm";
import { db } from "../index";
import { enrolments, observations, plots, seasons, trialTraits, traits, trials } from "../schema";
import { staffTrialScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";
import { SEED_COUNT_TRAITS } from "@/lib/domain/vocabulary/traits";

/**
 * The viewer's other trials of the same crop that have recorded values, newest season first, with the
 * measured traits they record (a CV needs a measured trait: no text, no yes/no, no seed counts): where a coordinator
 * planning this trial can take a CV from. Staff only; empty for a trial outside the viewer's programs.
 */
export async function listPlanningSources(viewer: Viewer, trialId: number) {
  if (!isStaff(viewer)) return [];
  const [self] = await db.select({ cropId: trials.cropId }).from(trials).where(and(eq(trials.id, trialId), staffTrialScope(viewer)));
  if (!self) return [];
  const rows = await db
    .select({ id: trials.id, code: trials.code, title: trials.title, season: seasons.name, year: seasons.year })
    .from(trials)
    .innerJoin(seasons, eq(seasons.id, trials.seasonId))
    .where(
      and(
        eq(trials.cropId, self.cropId),
        ne(trials.id, trialId),
        staffTrialScope(viewer),
        sql`EXISTS (SELECT 1 FROM ${plots} INNER JOIN ${enrolments} ON ${enrolments.id} = ${plots.enrolmentId} INNER JOIN ${observations} ON ${observations.plotId} = ${plots.id} WHERE ${enrolments.trialId} = ${trials.id})`,
      ),
    )
    .orderBy(desc(seasons.year), asc(trials.code))
    .limit(20);
  if (rows.length === 0) return [];
  const traitRows = await db
    .select({ trialId: trialTraits.trialId, id: traits.id, name: traits.name, valueType: traits.valueType })
    .from(trialTraits)
    .innerJoin(traits, eq(traits.id, trialTraits.traitId))
    .where(and(inArray(trialTraits.trialId, rows.map((r) => r.id)), notInArray(traits.valueType, ["text", "yes_no"]), notInArray(traits.code, [...SEED_COUNT_TRAITS])))
    // measured numbers (yield, weight) first: the trait a trial is usually sized for
    .orderBy(sql`${traits.valueType} = 'number' desc`, asc(trialTraits.sortOrder), asc(traits.id));
  return rows.map((r) => ({ id: r.id, code: r.code, title: r.title, season: r.season, year: r.year, traits: traitRows.filter((t) => t.trialId === r.id).map((t) => ({ id: t.id, name: t.name })) })).filter((r) => r.traits.length > 0);
}
export type PlanningSource = Awaited<ReturnType<typeof listPlanningSources>>[number];
