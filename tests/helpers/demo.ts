import { and, eq, sql } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Database } from "@/db/client";
import type { Viewer } from "@/lib/domain/viewer";

/** A demo person as the app sees them after sign-in. */
export async function demoViewer(db: Database, email: string): Promise<Viewer> {
  const [u] = await db.select({ id: s.users.id, email: s.users.email, name: s.users.name, role: s.users.role, locale: s.users.locale }).from(s.users).where(eq(s.users.email, email));
  if (!u) throw new Error(`demo user ${email} missing; reseed the test database`);
  return u;
}

/** A demo site in a demo trial: ids, plots in layout order and trait ids by code. */
export async function demoSite(db: Database, trialCode: string, siteName: string) {
  const [e] = await db
    .select({ enrolmentId: s.enrolments.id, trialId: s.trials.id, siteId: s.sites.id, sownOn: s.enrolments.sownOn })
    .from(s.enrolments)
    .innerJoin(s.trials, eq(s.trials.id, s.enrolments.trialId))
    .innerJoin(s.sites, eq(s.sites.id, s.enrolments.siteId))
    .where(and(eq(s.trials.code, trialCode), eq(s.sites.name, siteName)));
  if (!e) throw new Error(`demo site ${siteName} in ${trialCode} missing`);
  const plots = await db
    .select({ id: s.plots.id, plotCode: s.plots.plotCode, block: s.plots.block, entryId: s.plots.entryId })
    .from(s.plots)
    .where(eq(s.plots.enrolmentId, e.enrolmentId))
    .orderBy(s.plots.block, s.plots.position);
  const traitRows = await db.select({ id: s.traits.id, code: s.traits.code }).from(s.traits);
  const traitId = Object.fromEntries(traitRows.map((t) => [t.code, t.id])) as Record<string, number>;
  return { ...e, plots, traitId };
}

/**
 * Row counts of what a data write for one site touches, to prove a refused write left nothing behind.
 * Scoped to the enrolment so test files running in parallel on other sites do not disturb the numbers.
 */
export async function writeCounts(db: Database, enrolmentId: number) {
  const one = async (query: string) => {
    const [rows] = (await db.execute(sql.raw(query))) as unknown as [[{ n: number }]];
    return Number(rows[0]!.n);
  };
  const obs = `SELECT o.id FROM observations o JOIN plots p ON p.id = o.plot_id WHERE p.enrolment_id = ${Number(enrolmentId)}`;
  return {
    observations: await one(`SELECT COUNT(*) AS n FROM (${obs}) x`),
    history: await one(`SELECT COUNT(*) AS n FROM observation_history WHERE observation_id IN (${obs})`),
    audit: await one(`SELECT COUNT(*) AS n FROM audit_log WHERE entity = 'observation' AND entity_id IN (SELECT CAST(id AS CHAR) FROM (${obs}) y)`),
    submissions: await one(`SELECT COUNT(*) AS n FROM submissions WHERE enrolment_id = ${Number(enrolmentId)}`),
    photos: await one(`SELECT COUNT(*) AS n FROM photos WHERE enrolment_id = ${Number(enrolmentId)}`),
  };
}
