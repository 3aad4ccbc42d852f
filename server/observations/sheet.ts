import "server-only";
import type { Viewer } from "@/lib/domain/viewer";
import { entryColumns, type EntryColumn } from "@/lib/domain/observations/columns";
import type { CellValue } from "@/lib/domain/observations/values";
import type { MissingReason } from "@/lib/domain/observations/missing";
import { scheduleForSite, todayIso } from "@/lib/domain/schedule";
import { getRecordingRows, listPlotPacketDays, listRecordableSiteRows, listTrialTraits, type ObservationRow } from "@/db/queries/observations";
import { db, type Tx } from "@/db/index";
import { datesToCheck } from "@/lib/domain/observations/date-order";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

export interface StoredObservation extends CellValue {
  id: number;
  plotId: number;
  key: string;
  missingReason: MissingReason | null;
}

/** The columns recorded in a trial, in the trial's trait order (one per scheduled day for timed counts). */
export async function listTrialColumns(ex: Tx | typeof db, trialId: number): Promise<EntryColumn[]> {
  return entryColumns(await listTrialTraits(ex, trialId));
}

/** Stored values keyed by their column; values of traits no longer in the trial are left out. */
export function keyObservations(rows: ObservationRow[], columns: EntryColumn[]): StoredObservation[] {
  const keyOf = new Map(columns.map((c) => [`${c.traitId}:${c.occasion}`, c.key]));
  const out: StoredObservation[] = [];
  for (const r of rows) {
    const key = keyOf.get(`${r.traitId}:${r.occasion}`);
    if (key) out.push({ id: r.id, plotId: r.plotId, key, valueNumber: r.valueNumber, valueDate: r.valueDate, valueText: r.valueText, missingReason: r.missingReason });
  }
  return out;
}

/**
 * Everything the data-entry page needs for one site in one trial: plots in layout order, columns,
 * recorded values, what is due or late, the review state and open comments. Null when not the viewer's.
 */
export async function getRecordingSheet(viewer: Viewer, p: { trialId: number; siteId: number }, today: string = todayIso()) {
  const rows = await getRecordingRows(viewer, p);
  if (!rows) return null;
  const { enrolment, plots: plotRows, submission, comments } = rows;
  // Column names, units and due notes in the viewer's language; headings stay the stored ones uploads are read by.
  const t = translatorFor(viewer.locale);
  const columns = entryColumns(rows.traits, t);
  const stored = keyObservations(rows.observations, columns);
  const values: Record<number, Record<string, CellValue>> = {};
  const missing: Record<number, Record<string, MissingReason>> = {};
  const recorded = new Map<string, number>();
  for (const o of stored) {
    (values[o.plotId] ??= {})[o.key] = { valueNumber: o.valueNumber, valueDate: o.valueDate, valueText: o.valueText };
    if (o.missingReason) (missing[o.plotId] ??= {})[o.key] = o.missingReason;
    const col = columns.find((c) => c.key === o.key)!;
    // A plot marked missing with a reason is done for that count, just like one with a value.
    if (o.valueNumber !== null || o.valueDate !== null || o.valueText !== null || o.missingReason) recorded.set(`${col.traitId}:${col.occasion}`, (recorded.get(`${col.traitId}:${col.occasion}`) ?? 0) + 1);
  }
  const due = scheduleForSite({ sownOn: enrolment.sownOn, plotCount: plotRows.length, columns, recorded, today, t });
  const observationIds: Record<string, number> = {};
  for (const o of stored) observationIds[`${o.plotId}:${o.key}`] = o.id;
  return {
    enrolment: { ...enrolment, programId: undefined, cooperatorId: undefined },
    columns,
    plots: plotRows,
    values,
    missing,
    observationIds,
    due,
    submission,
    comments,
    today,
  };
}
export type RecordingSheet = NonNullable<Awaited<ReturnType<typeof getRecordingSheet>>>;

/**
 * Stored harvest and maturity dates far from the packet's days to maturity, by `plotId:key`, worded for the
 * viewer (a grower's wording never states the packet's figure). The phone form shows them under the saved
 * value; the order checks it works out itself, but it is never sent the packets.
 */
export async function packetChecksForViewer(viewer: Viewer, sheet: RecordingSheet): Promise<Record<string, string[]>> {
  const packetDays = await listPlotPacketDays(db, sheet.enrolment.enrolmentId);
  const site = { sownOn: sheet.enrolment.sownOn, transplantedOn: sheet.enrolment.transplantedOn };
  const audience = viewer.role === "cooperator" ? "grower" : "staff";
  const t = translatorFor(viewer.locale);
  const out: Record<string, string[]> = {};
  for (const plot of sheet.plots) {
    const found = datesToCheck({ columns: sheet.columns, value: (key) => sheet.values[plot.id]?.[key], site, packetDays: packetDays[plot.id] ?? null, audience, t });
    for (const w of found) if (w.kind === "far_from_packet") (out[`${plot.id}:${w.key}`] ??= []).push(w.message);
  }
  return out;
}

/** The sites the viewer records for in trials that are taking data, with their due and late counts. */
export async function listRecordableSites(viewer: Viewer, today: string = todayIso()) {
  const out = [];
  for (const r of await listRecordableSiteRows(viewer)) {
    const sheet = await getRecordingSheet(viewer, { trialId: r.trialId, siteId: r.siteId }, today);
    const due = sheet?.due ?? [];
    out.push({
      ...r,
      plotCount: sheet?.plots.length ?? 0,
      dueToday: due.filter((d) => d.status === "due_today"),
      late: due.filter((d) => d.status === "late"),
      openComments: sheet?.comments.length ?? 0,
    });
  }
  return out;
}
