import "server-only";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { saveObservationsSchema, siteParamsSchema } from "@/lib/validation/observations";
import { parseIn } from "@/lib/validation/field-errors";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { saveSiteObservations } from "./save";
import { getRecordingSheet } from "./sheet";

// The cores of the observation route handlers, taking the viewer so tests can call them without a session.

export async function saveObservationsForViewer(viewer: Viewer, body: unknown) {
  const t = translatorFor(viewer.locale);
  const parsed = parseIn(saveObservationsSchema, body, t);
  if (!parsed.success) throw new AppError("bad_request", parsed.error.issues[0]?.message ?? t("forms.notUnderstood"));
  const { trialId, siteId, values, clientSaveId } = parsed.data;
  const result = await saveSiteObservations(viewer, {
    trialId,
    siteId,
    source: "form",
    clientSaveId,
    cells: values.map((v) => ({ plotId: v.plotId, key: v.key, raw: v.value, missing: v.missingReason ?? null, knownSaved: v.knownSaved ? { raw: v.knownSaved.value, missing: v.knownSaved.missingReason } : undefined })),
  });
  return {
    ok: true as const,
    saved: result.saved,
    counts: result.counts,
    warnings: result.warnings.map((w) => ({ plotId: w.plotId, key: w.key, kind: w.kind, message: w.message })),
  };
}

export async function getRecordingSheetForApi(viewer: Viewer, params: { trialId: unknown; siteId: unknown }) {
  const t = translatorFor(viewer.locale);
  const parsed = siteParamsSchema.safeParse(params);
  if (!parsed.success) throw new AppError("not_found", t("forms.noSuchSite"));
  const sheet = await getRecordingSheet(viewer, parsed.data);
  if (!sheet) throw new AppError("not_found", t("forms.notYours"));
  return sheet;
}
