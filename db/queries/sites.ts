import "server-only";
import { asc, eq } from "drizzle-orm";
import { db } from "../index";
import { programs, siteCooperators, sites, users } from "../schema";
import { staffSiteScope } from "../access";
import type { Viewer } from "@/lib/domain/viewer";
import { isStaff } from "@/lib/domain/permissions";

/** Partner sites of the viewer's programs with their growers, for staff managing the network. Contact details are staff-only. */
export async function listSitesForStaff(viewer: Viewer) {
  if (!isStaff(viewer)) return [];
  const rows = await db
    .select({
      id: sites.id,
      name: sites.name,
      program: programs.name,
      kind: sites.kind,
      region: sites.region,
      growingSetup: sites.growingSetup,
      soil: sites.soil,
      irrigation: sites.irrigation,
      printLocale: sites.printLocale,
      latitude: sites.latitude,
      longitude: sites.longitude,
      contactName: sites.contactName,
      contactEmail: sites.contactEmail,
      growerName: users.name,
      growerInvited: users.passwordHash,
    })
    .from(sites)
    .innerJoin(programs, eq(programs.id, sites.programId))
    .leftJoin(siteCooperators, eq(siteCooperators.siteId, sites.id))
    .leftJoin(users, eq(users.id, siteCooperators.userId))
    .where(staffSiteScope(viewer))
    .orderBy(asc(sites.name));
  const byId = new Map<number, Omit<(typeof rows)[number], "growerName" | "growerInvited"> & { growers: { name: string; invited: boolean }[] }>();
  for (const { growerName, growerInvited, ...r } of rows) {
    const site = byId.get(r.id) ?? { ...r, growers: [] };
    if (growerName) site.growers.push({ name: growerName, invited: growerInvited === null });
    byId.set(r.id, site);
  }
  return [...byId.values()];
}
export type SiteRow = Awaited<ReturnType<typeof listSitesForStaff>>[number];
