import "server-only";
import { db } from "../index";
import { sites } from "../schema";
import { insertAudit } from "../audit";
import { and, eq } from "drizzle-orm";
import { isDuplicateKey, requireStaff, resolveProgram, staffSiteScope } from "../access";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import type { GrowingSetup, Locale, SITE_KINDS } from "@/lib/domain/vocabulary/enums";

/** A partner site as the form delivers it once validated (lib/validation/sites.ts). */
export interface SiteInput {
  /** The program the site joins; left out when the viewer runs only one. */
  programId?: number;
  name: string;
  kind: (typeof SITE_KINDS)[number];
  region: string;
  latitude?: number;
  longitude?: number;
  growingSetup: GrowingSetup;
  soil?: string;
  irrigation?: string;
  cooperatorName?: string;
  cooperatorEmail?: string;
}

/**
 * Adds a partner site to one of the viewer's programs. The grower named here is only a contact until the
 * site joins a trial; enrolment sends the invitation, so nobody gets mail for a site that never takes part.
 */
export async function insertSite(viewer: Viewer, input: SiteInput) {
  requireStaff(viewer);
  try {
    return await db.transaction(async (tx) => {
      const programId = await resolveProgram(tx, viewer, input.programId);
      const [row] = await tx
        .insert(sites)
        .values({
          programId,
          name: input.name,
          kind: input.kind,
          region: input.region,
          latitude: input.latitude ?? null,
          longitude: input.longitude ?? null,
          growingSetup: input.growingSetup,
          soil: input.soil ?? null,
          irrigation: input.irrigation ?? null,
          contactName: input.cooperatorName ?? null,
          contactEmail: input.cooperatorEmail ?? null,
        })
        .$returningId();
      await insertAudit(tx, { actorId: viewer.id, action: "create", entity: "site", entityId: row!.id, newValue: { ...input, programId, cooperatorEmail: input.cooperatorEmail ? "(set)" : null } });
      return row!.id;
    });
  } catch (e) {
    if (isDuplicateKey(e)) throw new AppError("conflict", "This program already has a site with this name.", { name: ["This program already has a site with this name."] });
    throw e;
  }
}

/** Sets the language of one of the viewer's program's sites' printouts (null: the language of whoever prints). */
export async function updateSitePrintLocale(viewer: Viewer, p: { siteId: number; printLocale: Locale | null }) {
  requireStaff(viewer);
  await db.transaction(async (tx) => {
    const [site] = await tx.select({ printLocale: sites.printLocale }).from(sites).where(and(eq(sites.id, p.siteId), staffSiteScope(viewer))).for("update");
    if (!site) throw new AppError("not_found", "That site does not exist, or it is not one of your program's.");
    await tx.update(sites).set({ printLocale: p.printLocale }).where(eq(sites.id, p.siteId));
    await insertAudit(tx, { actorId: viewer.id, action: "change_print_language", entity: "site", entityId: p.siteId, oldValue: { printLocale: site.printLocale }, newValue: { printLocale: p.printLocale } });
  });
}
