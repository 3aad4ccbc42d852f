import "server-only";
import { and, asc, count, eq, inArray, or, sql } from "drizzle-orm";
import { db, type Tx } from "../index";
import { enrolments, observations, plots, programCoordinators, seasons, seedLots, siteCooperators, sites, trialEntries, trialTraits, traits, trials, users, varieties, crops } from "../schema";
import type { TrialStatus } from "@/lib/domain/vocabulary/enums";
import { insertAudit } from "../audit";
import { isDuplicateKey, lockTrialForStaff, requireStaff, trialProgress, type LockedTrial } from "../access";
import { insertMail } from "./mail";
import { insertCooperatorInviteInTx } from "./users";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { blindCodes } from "@/lib/domain/design/blind-codes";
import { newSeed } from "@/lib/domain/design/random";
import { siteLayout } from "@/lib/domain/design/site-layout";
import { canChangeSowingDate, canEditDesign, canEditTraits, canEnrolSites, canRandomiseSite, designLockReason, statusChangeProblem } from "@/lib/domain/design/status";
import type { z } from "zod";
import type { addEntrySchema, createTrialSchema, updateTrialSchema } from "@/lib/validation/trials";
import type { OutgoingMail } from "@/lib/domain/mail/templates";

type CreateTrialInput = z.infer<typeof createTrialSchema>;
type UpdateTrialInput = z.infer<typeof updateTrialSchema>;

/**
 * A trial records built-in traits and its own program's traits, nothing of another program's. Traits it
 * already records stay allowed, so a trial from before programs owned traits can still be edited.
 */
async function checkTraitsUsable(tx: Tx, programId: number, traitIds: number[], alreadyRecorded: number[] = []) {
  if (traitIds.length === 0) return;
  const found = await tx
    .select({ id: traits.id })
    .from(traits)
    .where(and(inArray(traits.id, traitIds), or(eq(traits.builtIn, true), eq(traits.programId, programId), inArray(traits.id, [0, ...alreadyRecorded]))));
  if (found.length !== new Set(traitIds).size) throw new AppError("bad_request", "One of the chosen traits is not in this program's trait library.", { traitIds: ["Choose traits from the list."] });
}

async function replaceTraits(tx: Tx, trialId: number, traitIds: number[]) {
  await tx.delete(trialTraits).where(eq(trialTraits.trialId, trialId));
  if (traitIds.length > 0) await tx.insert(trialTraits).values([...new Set(traitIds)].map((traitId, i) => ({ trialId, traitId, sortOrder: i })));
}

/** Creates a draft trial in a season of one of the viewer's programs, with its traits, in one transaction. */
export async function insertTrial(viewer: Viewer, input: CreateTrialInput) {
  requireStaff(viewer);
  try {
    return await db.transaction(async (tx) => {
      const [season] = await tx
        .select({ id: seasons.id, programId: seasons.programId })
        .from(seasons)
        .where(
          viewer.role === "admin"
            ? eq(seasons.id, input.seasonId)
            : and(eq(seasons.id, input.seasonId), inArray(seasons.programId, tx.select({ id: programCoordinators.programId }).from(programCoordinators).where(eq(programCoordinators.userId, viewer.id)))),
        );
      if (!season) throw new AppError("bad_request", "Choose a season of a program you coordinate.", { seasonId: ["Choose a season from the list."] });
      const [crop] = await tx.select({ id: crops.id }).from(crops).where(eq(crops.id, input.cropId));
      if (!crop) throw new AppError("bad_request", "That crop is not in the catalogue.", { cropId: ["Choose a crop from the list."] });
      await checkTraitsUsable(tx, season.programId, input.traitIds);
      const [row] = await tx
        .insert(trials)
        .values({
          programId: season.programId,
          seasonId: season.id,
          cropId: input.cropId,
          code: input.code,
          title: input.title,
          purpose: input.purpose ?? null,
          design: input.design,
          blocks: input.blocks,
          plotUnit: input.plotUnit,
          plotSize: input.plotSize,
          seedsPerCell: input.seedsPerCell,
          protocol: input.protocol ?? null,
          status: "draft",
          createdById: viewer.id,
        })
        .$returningId();
      const trialId = row!.id;
      await replaceTraits(tx, trialId, input.traitIds);
      await insertAudit(tx, { actorId: viewer.id, action: "create", entity: "trial", entityId: trialId, trialId, newValue: input });
      return trialId;
    });
  } catch (e) {
    if (isDuplicateKey(e)) throw new AppError("conflict", "Another trial already uses this code.", { code: ["Another trial already uses this code."] });
    throw e;
  }
}

/** Edits the design. Blocks, plot unit and design freeze once a site is laid out; traits once data exist. */
export async function updateTrialDesign(viewer: Viewer, input: UpdateTrialInput) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const state = { status: trial.status, ...(await trialProgress(tx, trial.id)) };
    const designChanged = trial.design !== input.design || trial.blocks !== input.blocks || trial.plotUnit !== input.plotUnit || trial.plotSize !== input.plotSize;
    if (designChanged && !canEditDesign(state)) throw new AppError("conflict", designLockReason(state) ?? "The design can no longer change.");
    const currentTraits = (await tx.select({ id: trialTraits.traitId }).from(trialTraits).where(eq(trialTraits.trialId, trial.id)).orderBy(asc(trialTraits.sortOrder))).map((t) => t.id);
    // The form lists traits in library order, so only a different set counts as a change.
    const sortedIds = (ids: number[]) => [...new Set(ids)].sort((a, b) => a - b).join(",");
    const traitsChanged = sortedIds(currentTraits) !== sortedIds(input.traitIds);
    if (traitsChanged && !canEditTraits(state)) throw new AppError("conflict", "The traits can no longer change because data collection has started.");
    await checkTraitsUsable(tx, trial.programId, input.traitIds, currentTraits);
    await tx
      .update(trials)
      .set({ title: input.title, purpose: input.purpose ?? null, design: input.design, blocks: input.blocks, plotUnit: input.plotUnit, plotSize: input.plotSize, seedsPerCell: input.seedsPerCell, protocol: input.protocol ?? null })
      .where(eq(trials.id, trial.id));
    if (traitsChanged) await replaceTraits(tx, trial.id, input.traitIds);
    await insertAudit(tx, { actorId: viewer.id, action: "update", entity: "trial", entityId: trial.id, trialId: trial.id, oldValue: { ...trial, traitIds: currentTraits }, newValue: input });
  });
}

async function assertDesignEditable(tx: Tx, trial: LockedTrial) {
  const state = { status: trial.status, ...(await trialProgress(tx, trial.id)) };
  const reason = designLockReason(state);
  if (reason) throw new AppError("conflict", reason);
}

/**
 * Adds one of the program's varieties (and a seed lot of it) as an entry, with a fresh blind code no other
 * entry of the trial has. Another program's variety is refused as if it did not exist.
 */
export async function insertTrialEntry(viewer: Viewer, input: z.infer<typeof addEntrySchema>) {
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    await assertDesignEditable(tx, trial);
    const [variety] = await tx
      .select({ id: varieties.id, cropId: varieties.cropId, name: varieties.name })
      .from(varieties)
      .where(and(eq(varieties.id, input.varietyId), eq(varieties.programId, trial.programId)));
    if (!variety || variety.cropId !== trial.cropId) throw new AppError("bad_request", "Choose a variety of this trial's crop.", { varietyId: ["Choose a variety of this trial's crop."] });
    if (input.seedLotId !== undefined) {
      const [lot] = await tx.select({ varietyId: seedLots.varietyId }).from(seedLots).where(eq(seedLots.id, input.seedLotId));
      if (!lot || lot.varietyId !== variety.id) throw new AppError("bad_request", "That seed lot belongs to another variety.", { seedLotId: ["Choose a seed lot of this variety."] });
    }
    const existing = await tx.select({ varietyId: trialEntries.varietyId, blindCode: trialEntries.blindCode, entryNumber: trialEntries.entryNumber }).from(trialEntries).where(eq(trialEntries.trialId, trial.id));
    if (existing.some((e) => e.varietyId === variety.id)) {
      throw new AppError("conflict", `${variety.name} is already an entry in this trial.`, { varietyId: ["This variety is already an entry."] });
    }
    const [code] = blindCodes(1, newSeed(), existing.map((e) => e.blindCode));
    const entryNumber = existing.reduce((m, e) => Math.max(m, e.entryNumber), 0) + 1;
    const [row] = await tx
      .insert(trialEntries)
      .values({ trialId: trial.id, varietyId: variety.id, seedLotId: input.seedLotId ?? null, blindCode: code!, entryNumber, isCheck: input.isCheck })
      .$returningId();
    await insertAudit(tx, { actorId: viewer.id, action: "add_entry", entity: "trial_entry", entityId: row!.id, trialId: trial.id, newValue: { ...input, blindCode: code, entryNumber } });
    return { entryId: row!.id, blindCode: code! };
  });
}

/** Removes an entry while the design is still editable. */
export async function deleteTrialEntry(viewer: Viewer, input: { trialId: number; entryId: number }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    await assertDesignEditable(tx, trial);
    const [entry] = await tx.select({ id: trialEntries.id, varietyId: trialEntries.varietyId, blindCode: trialEntries.blindCode }).from(trialEntries).where(and(eq(trialEntries.id, input.entryId), eq(trialEntries.trialId, trial.id)));
    if (!entry) throw new AppError("not_found", "That entry is not in this trial.");
    await tx.delete(trialEntries).where(eq(trialEntries.id, entry.id));
    await insertAudit(tx, { actorId: viewer.id, action: "remove_entry", entity: "trial_entry", entityId: entry.id, trialId: trial.id, oldValue: entry });
  });
}

/** Builds the invitation for a grower without an account; supplied by the caller, which owns tokens and links. */
export type InviteFactory = (person: { name: string; email: string }) => { token: string; buildMail: (siteName: string) => OutgoingMail };

/**
 * Enrols one of the trial's program's sites (another program's site is refused as if it did not exist).
 * Its growers who have not set up an account get a fresh invitation; a site with only a contact e-mail
 * gets that person invited and attached; growers with accounts get a short notice. Everything, mail
 * included, is queued in the same transaction.
 */
export async function insertEnrolment(
  viewer: Viewer,
  input: { trialId: number; siteId: number; sownOn?: string },
  mail: { invite: InviteFactory; notice: (p: { to: string; name: string; siteName: string; trialTitle: string }) => OutgoingMail },
) {
  try {
    return await db.transaction(async (tx) => {
      const trial = await lockTrialForStaff(tx, viewer, input.trialId);
      const progress = await trialProgress(tx, trial.id);
      if (!canEnrolSites({ status: trial.status, ...progress })) throw new AppError("conflict", "Sites can only join a trial before analysis starts.");
      const [site] = await tx
        .select({ id: sites.id, name: sites.name, contactName: sites.contactName, contactEmail: sites.contactEmail })
        .from(sites)
        .where(and(eq(sites.id, input.siteId), eq(sites.programId, trial.programId)));
      if (!site) throw new AppError("bad_request", "Choose one of this program's sites.", { siteId: ["Choose a site from the list."] });
      const [titleRow] = await tx.select({ title: trials.title }).from(trials).where(eq(trials.id, trial.id));

      let growers = await tx
        .select({ id: users.id, name: users.name, email: users.email, invited: users.passwordHash, active: users.active })
        .from(siteCooperators)
        .innerJoin(users, eq(users.id, siteCooperators.userId))
        .where(eq(siteCooperators.siteId, site.id))
        .orderBy(asc(siteCooperators.id));
      const invited: string[] = [];
      if (growers.length === 0 && site.contactEmail && site.contactName) {
        const [account] = await tx.select({ id: users.id, role: users.role, passwordHash: users.passwordHash }).from(users).where(eq(users.email, site.contactEmail));
        if (account && account.passwordHash !== null && account.role === "cooperator") {
          await tx.insert(siteCooperators).values({ siteId: site.id, userId: account.id });
        } else if (!account || account.role === "cooperator") {
          const inv = mail.invite({ name: site.contactName, email: site.contactEmail });
          await insertCooperatorInviteInTx(tx, { viewer, name: site.contactName, email: site.contactEmail, siteId: site.id, token: inv.token, buildMail: inv.buildMail });
          invited.push(site.contactEmail);
        }
        growers = await tx
          .select({ id: users.id, name: users.name, email: users.email, invited: users.passwordHash, active: users.active })
          .from(siteCooperators)
          .innerJoin(users, eq(users.id, siteCooperators.userId))
          .where(eq(siteCooperators.siteId, site.id));
      } else {
        for (const g of growers.filter((g) => g.invited === null && g.active)) {
          const inv = mail.invite({ name: g.name, email: g.email });
          await insertCooperatorInviteInTx(tx, { viewer, name: g.name, email: g.email, siteId: site.id, token: inv.token, buildMail: inv.buildMail });
          invited.push(g.email);
        }
      }
      for (const g of growers.filter((g) => g.invited !== null && g.active)) {
        await insertMail(tx, mail.notice({ to: g.email, name: g.name, siteName: site.name, trialTitle: titleRow!.title }));
      }
      const [row] = await tx
        .insert(enrolments)
        .values({ trialId: trial.id, siteId: site.id, cooperatorId: growers[0]?.id ?? null, sownOn: input.sownOn ?? null })
        .$returningId();
      await insertAudit(tx, { actorId: viewer.id, action: "enrol_site", entity: "enrolment", entityId: row!.id, trialId: trial.id, newValue: { siteId: site.id, sownOn: input.sownOn ?? null, invited } });
      return { enrolmentId: row!.id, invited };
    });
  } catch (e) {
    if (isDuplicateKey(e)) throw new AppError("conflict", "This site is already enrolled in the trial.", { siteId: ["This site is already enrolled."] });
    throw e;
  }
}

/**
 * Lays out one site: a fresh RCBD (or CRD) from a stored seed, packed onto flats for tray trials.
 * Allowed until data exist at the site; the old and new seeds go into the audit log.
 * `seed` is for tests and for reproducing a stored layout; normally a new one is drawn.
 */
export async function updateSiteRandomisation(viewer: Viewer, input: { trialId: number; siteId: number; seed?: number }) {
  return db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const [enrolment] = await tx
      .select({ id: enrolments.id, randomSeed: enrolments.randomSeed, randomisedAt: enrolments.randomisedAt })
      .from(enrolments)
      .where(and(eq(enrolments.trialId, trial.id), eq(enrolments.siteId, input.siteId)))
      .for("update");
    if (!enrolment) throw new AppError("not_found", "This site is not enrolled in the trial.");
    const [observed] = await tx.select({ n: count() }).from(observations).innerJoin(plots, eq(plots.id, observations.plotId)).where(eq(plots.enrolmentId, enrolment.id));
    if (!canRandomiseSite(trial, observed?.n ?? 0)) {
      throw new AppError(
        "conflict",
        (observed?.n ?? 0) > 0
          ? "This site already has recorded data, so its layout can no longer change."
          : "Layouts can only change while the trial is a draft, open or collecting.",
      );
    }
    const entries = await tx.select({ id: trialEntries.id }).from(trialEntries).where(eq(trialEntries.trialId, trial.id)).orderBy(asc(trialEntries.entryNumber));
    if (entries.length < 2) throw new AppError("conflict", "Add at least two entries before laying out plots.");

    // Site numbers in plot codes follow enrolment order, so they never change when a site is re-randomised.
    const siblings = await tx.select({ id: enrolments.id }).from(enrolments).where(eq(enrolments.trialId, trial.id)).orderBy(asc(enrolments.id));
    const siteNumber = siblings.findIndex((s) => s.id === enrolment.id) + 1;

    const seed = (input.seed ?? newSeed()) >>> 0;
    const layout = siteLayout({ design: trial.design, blocks: trial.blocks, plotUnit: trial.plotUnit, plotSize: trial.plotSize, entryCount: entries.length, seed, siteNumber });

    await tx.delete(plots).where(eq(plots.enrolmentId, enrolment.id));
    await tx.insert(plots).values(
      layout.map((p) => ({
        enrolmentId: enrolment.id,
        trialId: trial.id,
        siteId: input.siteId,
        entryId: entries[p.entryIndex]!.id,
        plotCode: p.plotCode,
        block: p.block,
        position: p.position,
        tray: p.tray,
        traySlot: p.traySlot,
      })),
    );
    await tx.update(enrolments).set({ randomSeed: seed, randomisedAt: new Date() }).where(eq(enrolments.id, enrolment.id));
    await insertAudit(tx, {
      actorId: viewer.id,
      action: enrolment.randomisedAt ? "rerandomise" : "randomise",
      entity: "enrolment",
      entityId: enrolment.id,
      trialId: trial.id,
      oldValue: enrolment.randomisedAt ? { seed: enrolment.randomSeed } : null,
      newValue: { seed, plots: layout.length },
    });
    return { seed, plots: layout.length };
  });
}

/**
 * Changes a site's sowing date. Due dates are not stored: schedules, sheets and reminders compute them from
 * this date, so they all move with it, and so do days-to-emergence and days-to-harvest, which the analysis
 * counts from it. Refused once results are published or archived, and refused when a value at the site
 * was recorded (or a recorded date falls) before the new date, since nothing can be observed before sowing.
 */
export async function updateSowingDate(viewer: Viewer, input: { trialId: number; siteId: number; sownOn: string }) {
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
    const [enrolment] = await tx
      .select({ id: enrolments.id, sownOn: enrolments.sownOn })
      .from(enrolments)
      .where(and(eq(enrolments.trialId, trial.id), eq(enrolments.siteId, input.siteId)))
      .for("update");
    if (!enrolment) throw new AppError("not_found", "This site is not enrolled in the trial.");
    const [recorded] = await tx
      .select({
        values: count(),
        firstObserved: sql<string | null>`MIN(${observations.observedOn})`,
        firstDate: sql<string | null>`MIN(${observations.valueDate})`,
      })
      .from(observations)
      .innerJoin(plots, eq(plots.id, observations.plotId))
      .where(eq(plots.enrolmentId, enrolment.id));
    const earliest = [recorded?.firstObserved, recorded?.firstDate].map((d) => (d ? String(d).slice(0, 10) : null)).filter((d): d is string => d !== null).sort()[0];
    if (earliest && input.sownOn > earliest) {
      const message = `A value at this site is dated ${earliest}, before ${input.sownOn}. Nothing can be observed before sowing, so the sowing date must be on or before ${earliest}.`;
      throw new AppError("conflict", message, { sownOn: [message] });
    }
    if (enrolment.sownOn === input.sownOn) return { changed: false, values: recorded?.values ?? 0 };
    await tx.update(enrolments).set({ sownOn: input.sownOn }).where(eq(enrolments.id, enrolment.id));
    await insertAudit(tx, {
      actorId: viewer.id,
      action: "change_sowing_date",
      entity: "enrolment",
      entityId: enrolment.id,
      trialId: trial.id,
      oldValue: { sownOn: enrolment.sownOn },
      newValue: { sownOn: input.sownOn, valuesAtSite: recorded?.values ?? 0 },
    });
    return { changed: true, values: recorded?.values ?? 0 };
  });
}

/** Moves a trial one step along its life cycle when the status rules allow it. */
export async function updateTrialStatus(viewer: Viewer, input: { trialId: number; status: TrialStatus }) {
  await db.transaction(async (tx) => {
    const trial = await lockTrialForStaff(tx, viewer, input.trialId);
    const progress = await trialProgress(tx, trial.id);
    const [e] = await tx.select({ n: count() }).from(trialEntries).where(eq(trialEntries.trialId, trial.id));
    const [t] = await tx.select({ n: count() }).from(trialTraits).where(eq(trialTraits.trialId, trial.id));
    const [s] = await tx.select({ n: count() }).from(enrolments).where(eq(enrolments.trialId, trial.id));
    const problem = statusChangeProblem({ status: trial.status, ...progress, entries: e?.n ?? 0, traits: t?.n ?? 0, sites: s?.n ?? 0 }, input.status);
    if (problem) throw new AppError("conflict", problem);
    await tx.update(trials).set({ status: input.status }).where(eq(trials.id, trial.id));
    await insertAudit(tx, { actorId: viewer.id, action: "change_status", entity: "trial", entityId: trial.id, trialId: trial.id, oldValue: { status: trial.status }, newValue: { status: input.status } });
  });
}
