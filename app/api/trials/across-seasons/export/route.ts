import { AppError } from "@/lib/errors";
import { acrossSeasonsExportSchema } from "@/lib/validation/analysis";
import { loadAcrossSeasons } from "@/server/analysis/across-seasons";
import { ACROSS_SEASONS_CSV, acrossSeasonsTables } from "@/lib/domain/analysis/across-seasons-export";
import { csvFile, tablesXlsx } from "@/lib/domain/spreadsheets/write";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

/** The across-seasons view of one crop and trait as an .xlsx workbook, or one of its tables as CSV (staff, own programs' trials only). */
export const GET = defineRoute({ roles: ["coordinator", "admin"], query: { schema: acrossSeasonsExportSchema } }, async ({ viewer, query }) => {
  const view = await loadAcrossSeasons(viewer, { cropId: query.crop, traitCode: query.trait });
  // A crop with no trial in the viewer's programs answers like one that does not exist.
  if (!view?.crop) throw new AppError("not_found", "None of your programs' trials grows that crop.");
  if (!view.trait) throw new AppError("not_found", `No trial of ${view.crop.name} in your programs records that trait.`);
  const tables = acrossSeasonsTables({ crop: view.crop, trait: view.trait, outcome: view.outcome, trials: view.trials }, new Date().toISOString());
  const base = `${view.crop.name}-${view.trait.code}-across-seasons`.toLowerCase().replace(/[^a-z0-9-]+/g, "-");
  const headers = { "Cache-Control": "private, no-store" };

  if (query.format === "csv") {
    const table = tables.find((t) => t.name === ACROSS_SEASONS_CSV[query.table]);
    if (!table) throw new AppError("not_found", view.outcome?.mixedProblem ?? "No trial of this crop has data for this trait yet.");
    return new Response(csvFile([table.columns, ...table.rows]), {
      headers: { ...headers, "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${base}-${query.table}.csv"` },
    });
  }

  return new Response(await tablesXlsx(tables), {
    headers: { ...headers, "Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet", "Content-Disposition": `attachment; filename="${base}.xlsx"` },
  });
});
