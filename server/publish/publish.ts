import "server-only";
import { getAnalysisTrialStatus } from "@/db/queries/analysis";
import { publishBlockReason } from "@/lib/domain/design/status";
import { db } from "@/db/index";
import { lockTrialForStaff } from "@/db/access";
import { insertPublishedReport, updateReportsWithdrawn } from "@/db/mutations/publish";
import { countLiveReports, getLatestReportVersion, listPublishSites, listTrialCooperatorEmails } from "@/db/queries/publish";
import { resultsPublishedMail, resultsPublishedWithoutSiteMail, type OutgoingMail } from "@/lib/domain/mail/templates";
import { confirmsExactly, leftOutSiteIds, publicNotIncludedWhy, siteInclusion, wholeSiteExclusions, type SiteInclusion } from "@/lib/domain/publish/site-inclusion";
import type { Tx } from "@/db/index";
import type { PublishSettings } from "@/lib/domain/publish/types";
import type { Viewer } from "@/lib/domain/viewer";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { buildSnapshot } from "./build";

const NOT_YOURS = "That trial does not exist or is not in your programs.";

/**
 * Which enrolled sites a publication now would include, and why not the others. Given the transaction,
 * the sites' submissions are read under a lock. Null when the trial is not the viewer's.
 */
export async function readSiteInclusion(viewer: Viewer, trialId: number, tx?: Tx): Promise<SiteInclusion[] | null> {
  const rows = await listPublishSites(viewer, { trialId, tx });
  if (!rows) return null;
  const whole = wholeSiteExclusions(rows.exclusions);
  return siteInclusion(rows.sites.map((s) => ({ ...s, excludedAs: whole.get(s.siteId) ?? null })));
}

const namesOf = (inclusion: SiteInclusion[], ids: number[]) => inclusion.filter((s) => ids.includes(s.siteId)).map((s) => s.siteName).join(", ");

/** Why a publication's confirmation does not match the sites it would leave out, in the coordinator's words. */
function leftOutNotConfirmed(inclusion: SiteInclusion[], leftOut: number[], confirmed: number[]): AppError {
  const names = namesOf(inclusion, leftOut);
  if (confirmed.length === 0) {
    const them = leftOut.length === 1 ? "it" : "them";
    return new AppError("conflict", `This version would leave out ${names}. Tick the box that names ${them} to publish without ${them}, or accept ${leftOut.length === 1 ? "its" : "their"} data first.`, {
      confirmLeftOut: [`Tick this box to publish without ${names}.`],
    });
  }
  const message =
    leftOut.length === 0
      ? "Every site is now included, but the form named sites to leave out: the sites changed since this page was opened. Reload the page and check the list of sites again."
      : `The sites left out changed since this page was opened: this version would now leave out ${names}. Reload the page and check the list of sites again.`;
  return new AppError("conflict", message, { confirmLeftOut: [message] });
}

/**
 * Publishes a trial (or one trait) as a new immutable version, in three steps: the next version number,
 * the snapshot built from the accepted data, then the version, the trial's new status, the audit entry and
 * the notices to its cooperators stored in one transaction. A correction (version 2 and later) needs a
 * change note. A version that leaves out any enrolled site (data not accepted, none recorded, or excluded
 * whole) needs `confirmedLeftOut` to name exactly those sites, checked again under the lock, so a form
 * opened before a review decision cannot publish without a site its coordinator did not see named.
 * Only the growers of included sites are told their site's results are out; growers whose sites are
 * all left out get a plain note saying so. The analysis runs before the transaction so the trial's row
 * lock is held only for the write.
 */
export async function publishResults(
  viewer: Viewer,
  p: { trialId: number; traitId: number | null; settings: PublishSettings; changeNote: string | null; confirmedLeftOut: number[] },
): Promise<{ id: number; version: number }> {
  const latest = await getLatestReportVersion(viewer, { trialId: p.trialId });
  if (latest === null) throw new AppError("not_found", NOT_YOURS);
  // Said first, before any site list or analysis: the stage is the reason, whatever the data (checked again under the lock).
  const stage = await getAnalysisTrialStatus(viewer, p.trialId);
  const notYet = stage === null ? null : publishBlockReason(stage);
  if (notYet) throw new AppError("conflict", notYet);
  const version = latest + 1;
  if (version > 1 && !p.changeNote) {
    throw new AppError("bad_request", "Say what changed since the last version.", { changeNote: ["A correction needs a change note."] });
  }
  const inclusion = await readSiteInclusion(viewer, p.trialId);
  if (!inclusion) throw new AppError("not_found", NOT_YOURS);
  const leftOut = leftOutSiteIds(inclusion);
  if (inclusion.length > 0 && leftOut.length === inclusion.length) {
    throw new AppError("conflict", "No site has accepted data that can be analysed yet. Accept at least one site's data first.");
  }
  if (!confirmsExactly(p.confirmedLeftOut, leftOut)) throw leftOutNotConfirmed(inclusion, leftOut, p.confirmedLeftOut);
  // Whole seconds: the stored timestamp has no fractions, and the snapshot must name the same moment.
  const publishedAt = new Date(Math.floor(Date.now() / 1000) * 1000);
  const snapshot = await buildSnapshot(viewer, { trialId: p.trialId, traitId: p.traitId, settings: p.settings, version, changeNote: p.changeNote, publishedAt, siteInclusion: inclusion });
  const link = `${env.APP_URL}/results/${snapshot.trial.code}`;
  const mails = noticesFor(inclusion, await listTrialCooperatorEmails(p.trialId), { trialTitle: snapshot.trial.title, version, link });

  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, p.trialId);
    const blocked = publishBlockReason(trial.status);
    if (blocked) {
      throw new AppError("conflict", blocked);
    }
    if ((await getLatestReportVersion(viewer, { trialId: p.trialId, tx })) !== latest) {
      throw new AppError("conflict", "Someone published this trial at the same moment. Reload and try again.");
    }
    const now = await readSiteInclusion(viewer, p.trialId, tx);
    if (!now || now.map((s) => `${s.siteId}:${s.reason}`).join() !== inclusion.map((s) => `${s.siteId}:${s.reason}`).join()) {
      throw new AppError("conflict", "A site's data changed while publishing. Reload the page and check the list of sites again.");
    }
    const id = await insertPublishedReport(tx, {
      actorId: viewer.id,
      trialId: p.trialId,
      previousStatus: trial.status,
      version,
      traitId: p.traitId,
      settings: p.settings,
      snapshot: JSON.stringify(snapshot),
      changeNote: p.changeNote,
      publishedAt,
      mails,
    });
    return { id, version };
  });
}

/**
 * One notice per grower: "results are out" when at least one of their sites is included, otherwise a
 * plain note that this version leaves their site out and why (public words, no review states).
 */
function noticesFor(inclusion: SiteInclusion[], growers: { siteId: number; email: string; name: string }[], p: { trialTitle: string; version: number; link: string }): OutgoingMail[] {
  const bySite = new Map(inclusion.map((s) => [s.siteId, s]));
  const byGrower = new Map<string, { name: string; sites: SiteInclusion[] }>();
  for (const g of growers) {
    const site = bySite.get(g.siteId);
    if (!site) continue;
    const entry = byGrower.get(g.email) ?? { name: g.name, sites: [] };
    entry.sites.push(site);
    byGrower.set(g.email, entry);
  }
  return [...byGrower].map(([to, g]) =>
    g.sites.some((s) => s.included)
      ? resultsPublishedMail({ to, name: g.name, trialTitle: p.trialTitle, version: p.version, link: p.link })
      : resultsPublishedWithoutSiteMail({ to, name: g.name, trialTitle: p.trialTitle, version: p.version, link: p.link, sites: g.sites.map((s) => ({ name: s.siteName, why: publicNotIncludedWhy(s) })) }),
  );
}

/** Withdraws every live version of a trial, keeping them for the record and showing the reason publicly. */
export async function withdrawResults(viewer: Viewer, p: { trialId: number; reason: string }): Promise<void> {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, p.trialId);
    if ((await countLiveReports(viewer, { trialId: p.trialId, tx })) === 0) throw new AppError("conflict", "This trial has no published results to withdraw.");
    await updateReportsWithdrawn(tx, { actorId: viewer.id, trialId: p.trialId, previousStatus: trial.status, reason: p.reason, withdrawnAt: new Date() });
  });
}
