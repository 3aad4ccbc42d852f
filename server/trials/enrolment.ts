import "server-only";
import { db, type Tx } from "@/db/index";
import { lockTrialForStaff, trialProgress, type LockedTrial } from "@/db/access";
import { insertMail } from "@/db/mutations/mail";
import { listPlotPhotoKeys } from "@/db/mutations/photos";
import { deleteStoredPhotos } from "@/server/photos/stored-objects";
import { insertSiteCooperator, lockAccountByEmail } from "@/db/mutations/users";
import {
  countSiteObservations,
  getProgramSite,
  insertEnrolment,
  listEnrolmentIds,
  listSiteGrowers,
  listTrialEntries,
  lockEnrolment,
  replaceSitePlots,
  updateSiteNaming,
  updateSowingDate,
} from "@/db/mutations/trials";
import { newSeed } from "@/lib/domain/design/random";
import { siteLayout } from "@/lib/domain/design/site-layout";
import { canChangeSowingDate, canEnrolSites, canRandomiseSite } from "@/lib/domain/design/status";
import { enrolmentNoticeMail } from "@/lib/domain/mail/templates";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import type { Viewer } from "@/lib/domain/viewer";
import { AppError } from "@/lib/errors";
import { env } from "@/lib/env";
import { inviteGrowerInTx } from "@/server/users/invitations";

// A trial's sites: enrolling them (inviting their growers), laying out their plots and moving their
// sowing dates, each in one transaction on the trial locked for it.

/**
 * Enrols one of the trial's program's sites (another program's site is refused as if it did not exist).
 * Its growers who have not set up an account get a fresh invitation; a site with only a contact e-mail
 * gets that person invited and attached; growers with accounts get a short notice. Everything, mail
 * included, is queued in the same transaction.
 */
export async function enrolTrialSite(viewer: Viewer, input: { trialId: number; siteId: number; sownOn?: string; namedInResults?: boolean }) {
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const progress = await trialProgress(tx, trial.id);
    if (!canEnrolSites({ status: trial.status, ...progress })) throw new AppError("conflict", "Sites can only join a trial before analysis starts.");
    return enrolSiteInTx(tx, viewer, trial, input);
  });
}

/** Enrols a site in a trial already locked in `tx` (see enrolTrialSite), with its growers' invitations and notices. */
export async function enrolSiteInTx(tx: Tx, viewer: Viewer, trial: LockedTrial, input: { siteId: number; sownOn?: string; namedInResults?: boolean }) {
  {
    const site = await getProgramSite(tx, { programId: trial.programId, siteId: input.siteId });

    let growers = await listSiteGrowers(tx, site.id);
    const invited: string[] = [];
    const invite = async (person: { name: string; email: string }) => {
      await inviteGrowerInTx(tx, { viewer, name: person.name, email: person.email, siteId: site.id, noticeForAccount: false });
      invited.push(person.email);
    };
    if (growers.length === 0 && site.contactEmail && site.contactName) {
      const account = await lockAccountByEmail(tx, site.contactEmail);
      if (account && account.hasPassword && account.role === "cooperator") await insertSiteCooperator(tx, { siteId: site.id, userId: account.id });
      else if (!account || account.role === "cooperator") await invite({ name: site.contactName, email: site.contactEmail });
      growers = await listSiteGrowers(tx, site.id);
    } else {
      for (const g of growers.filter((g) => !g.hasAccount && g.active)) await invite(g);
    }
    for (const g of growers.filter((g) => g.hasAccount && g.active)) {
      await insertMail(tx, enrolmentNoticeMail({ to: g.email, name: g.name, siteName: site.name, trialTitle: trial.title, link: `${env.APP_URL}${withLanguage("/portal", g.locale)}`, locale: g.locale }));
    }
    const enrolmentId = await insertEnrolment(tx, { viewer, trialId: trial.id, siteId: site.id, cooperatorId: growers[0]?.id ?? null, sownOn: input.sownOn, invited, namedInResults: input.namedInResults ?? false });
    return { enrolmentId, invited };
  }
}

/**
 * Lays out one site: a fresh RCBD (or CRD) from a stored seed, packed onto flats for tray trials.
 * Allowed until data exist at the site; the old and new seeds go into the audit log.
 * `seed` is for tests and for reproducing a stored layout; normally a new one is drawn.
 */
export async function randomiseTrialSite(viewer: Viewer, input: { trialId: number; siteId: number; seed?: number }) {
  const laidOut = await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const enrolment = await lockEnrolment(tx, { trialId: trial.id, siteId: input.siteId });
    const { values } = await countSiteObservations(tx, enrolment.id);
    if (!canRandomiseSite(trial, values)) {
      throw new AppError(
        "conflict",
        values > 0 ? "This site already has recorded data, so its layout can no longer change." : "Layouts can only change while the trial is a draft, open or collecting.",
      );
    }
    const entries = await listTrialEntries(tx, trial.id);
    if (entries.length < 2) throw new AppError("conflict", "Add at least two entries before laying out plots.");

    // Site numbers in plot codes follow enrolment order, so they never change when a site is re-randomised.
    const siteNumber = (await listEnrolmentIds(tx, trial.id)).indexOf(enrolment.id) + 1;
    const seed = (input.seed ?? newSeed()) >>> 0;
    const layout = siteLayout({ design: trial.design, blocks: trial.blocks, plotUnit: trial.plotUnit, plotSize: trial.plotSize, entryCount: entries.length, seed, siteNumber });

    // Photos of the old plots go with them (ON DELETE CASCADE); their objects are deleted once this commits.
    const photoKeys = await listPlotPhotoKeys(tx, enrolment.id);
    await replaceSitePlots(tx, { viewer, trialId: trial.id, siteId: input.siteId, enrolment, entryIds: entries.map((e) => e.id), layout, seed });
    return { seed, plots: layout.length, photoKeys };
  });
  await deleteStoredPhotos(laidOut.photoKeys);
  return { seed: laidOut.seed, plots: laidOut.plots };
}

/**
 * Changes a site's sowing date. Due dates are not stored: schedules, sheets and reminders compute them from
 * this date, so they all move with it, and so do days-to-emergence and days-to-harvest, which the analysis
 * counts from it. Refused once results are published or archived, and refused when a value at the site
 * was recorded (or a recorded date falls) before the new date, since nothing can be observed before sowing.
 */
export async function moveSowingDate(viewer: Viewer, input: { trialId: number; siteId: number; sownOn: string }) {
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    if (!canChangeSowingDate(trial)) {
      throw new AppError(
        "conflict",
        trial.status === "archived"
          ? "This trial is archived, so its sowing dates can no longer change."
          : "This trial's results are published with these sowing dates. Withdraw the published results first if a date was wrong.",
      );
    }
    const enrolment = await lockEnrolment(tx, { trialId: trial.id, siteId: input.siteId });
    const recorded = await countSiteObservations(tx, enrolment.id);
    const earliest = [recorded.firstObserved, recorded.firstDate].map((d) => (d ? String(d).slice(0, 10) : null)).filter((d): d is string => d !== null).sort()[0];
    if (earliest && input.sownOn > earliest) {
      const message = `A value at this site is dated ${earliest}, before ${input.sownOn}. Nothing can be observed before sowing, so the sowing date must be on or before ${earliest}.`;
      throw new AppError("conflict", message, { sownOn: [message] });
    }
    if (enrolment.sownOn === input.sownOn) return { changed: false, values: recorded.values };
    await updateSowingDate(tx, { viewer, trialId: trial.id, enrolment, sownOn: input.sownOn, valuesAtSite: recorded.values });
    return { changed: true, values: recorded.values };
  });
}

/**
 * Records whether the site's grower agreed to be named in public results. Versions already published keep
 * the naming they were published with; the next version follows the new answer.
 */
export async function setSiteNaming(viewer: Viewer, input: { trialId: number; siteId: number; named: boolean }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    if (!(await updateSiteNaming(tx, { viewer, siteId: input.siteId, named: input.named, trialId: trial.id }))) throw new AppError("not_found", "That site is not part of this trial.");
  });
}
