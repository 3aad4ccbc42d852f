import "server-only";
import { AppError } from "@/lib/errors";
import type { Viewer } from "@/lib/domain/viewer";
import { getRecordingSheet } from "@/server/observations/sheet";
import { siteParamsSchema } from "@/lib/validation/observations";
import { buildCsvExport, buildTemplate, type TemplateInput } from "@/lib/domain/spreadsheets/template";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

async function templateInput(viewer: Viewer, params: unknown): Promise<TemplateInput & { fileStem: string }> {
  const t = translatorFor(viewer.locale);
  const parsed = siteParamsSchema.safeParse(params);
  if (!parsed.success) throw new AppError("not_found", t("forms.noSuchSite"));
  const sheet = await getRecordingSheet(viewer, parsed.data);
  if (!sheet) throw new AppError("not_found", t("forms.notYours"));
  if (sheet.plots.length === 0) throw new AppError("conflict", t("forms.noLayoutToFill"));
  const e = sheet.enrolment;
  return {
    trialCode: e.trialCode,
    trialTitle: e.trialTitle,
    siteName: e.siteName,
    sownOn: e.sownOn,
    columns: sheet.columns,
    plots: sheet.plots,
    values: sheet.values,
    missing: sheet.missing,
    locale: viewer.locale,
    fileStem: `${e.trialCode}-${e.siteName}`.replace(/[^A-Za-z0-9]+/g, "-").toLowerCase(),
  };
}

/** The site's .xlsx template with recorded values filled in (route core; the viewer is already signed in). */
export async function templateForViewer(viewer: Viewer, params: unknown) {
  const input = await templateInput(viewer, params);
  return { fileName: `${input.fileStem}-data.xlsx`, body: await buildTemplate(input) };
}

/** The site's recorded values as CSV, safe to open in a spreadsheet program. */
export async function csvExportForViewer(viewer: Viewer, params: unknown) {
  const input = await templateInput(viewer, params);
  return { fileName: `${input.fileStem}-data.csv`, body: buildCsvExport(input) };
}
