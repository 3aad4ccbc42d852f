import "server-only";
import { asc } from "drizzle-orm";
import { db } from "../index";
import { programs } from "../schema";
import { programScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

/** Programs a new site, variety or trait may join: the coordinator's own, every program for admins. */
export async function listProgramOptions(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  return db.select({ id: programs.id, name: programs.name }).from(programs).where(programScope(viewer, programs.id)).orderBy(asc(programs.name));
}
export type ProgramOption = Awaited<ReturnType<typeof listProgramOptions>>[number];
