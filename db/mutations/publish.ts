import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import type { Tx } from "../index";
import { publicGeneration, publishedReports, trials } from "../schema";
import { insertAudit } from "../audit";
import { insertMail } from "./mail";
import type { TrialStatus } from "@/lib/domain/vocabulary/enums";
import type { PublishSettings } from "@/lib/domain/publish/types";
import type { OutgoingMail } from "@/lib/domain/mail/templates";

/** A version ready to store, decided and built by server/publish/publish.ts. */
export interface PreparedPublication {
  actorId: number;
  trialId: number;
  /** the trial's status before publishing, for the audit entry */
  previousStatus: TrialStatus;
  version: number;
  traitId: number | null;
  settings: PublishSettings;
  /** the frozen snapshot as JSON text */
  snapshot: string;
  changeNote: string | null;
  publishedAt: Date;
  /** the notices to the trial's cooperators */
  mails: OutgoingMail[];
}

/**
 * Stores a published version in the caller's transaction: the snapshot row, the trial marked published,
 * the audit entry and the queued notices. Returns the new report's id.
 */
export async function insertPublishedReport(tx: Tx, p: PreparedPublication): Promise<number> {
  const [row] = await tx
    .insert(publishedReports)
    .values({
      trialId: p.trialId,
      version: p.version,
      traitId: p.traitId,
      settings: p.settings,
      snapshot: p.snapshot,
      changeNote: p.changeNote,
      publishedById: p.actorId,
      publishedAt: p.publishedAt,
    })
    .$returningId();
  await tx.update(trials).set({ status: "published" }).where(eq(trials.id, p.trialId));
  await insertAudit(tx, { actorId: p.actorId, action: "publish", entity: "trial", entityId: p.trialId, trialId: p.trialId, oldValue: { status: p.previousStatus }, newValue: { version: p.version, traitId: p.traitId } });
  for (const mail of p.mails) await insertMail(tx, mail);
  await renewPublicGeneration(tx);
  return row!.id;
}

/**
 * Gives the public generation a new stamp in the caller's transaction. Every write that changes what the
 * public pages or API show calls it, so each app instance's public cache sees the change at its next
 * request (server/publish/public-cache.ts).
 */
export async function renewPublicGeneration(tx: Tx) {
  await tx.insert(publicGeneration).values({ id: 1, stamp: sql`UUID()` }).onDuplicateKeyUpdate({ set: { stamp: sql`UUID()` } });
}

/**
 * Withdraws every live version of a trial in the caller's transaction, keeping them for the record with
 * the reason shown publicly; the trial goes back to analysing, with an audit entry.
 */
export async function updateReportsWithdrawn(tx: Tx, p: { actorId: number; trialId: number; previousStatus: TrialStatus; reason: string; withdrawnAt: Date }) {
  await tx
    .update(publishedReports)
    .set({ unpublishedAt: p.withdrawnAt, unpublishReason: p.reason })
    .where(and(eq(publishedReports.trialId, p.trialId), isNull(publishedReports.unpublishedAt)));
  await tx.update(trials).set({ status: "analysing" }).where(eq(trials.id, p.trialId));
  await renewPublicGeneration(tx);
  await insertAudit(tx, { actorId: p.actorId, action: "unpublish", entity: "trial", entityId: p.trialId, trialId: p.trialId, oldValue: { status: p.previousStatus }, newValue: { reason: p.reason } });
}
