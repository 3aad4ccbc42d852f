import { z } from "zod";
import { AppError } from "@/lib/errors";
import { idParam } from "@/lib/validation/common";
import { parseAnalysisQuery } from "@/lib/validation/analysis";
import { loadAnalysis } from "@/server/analysis/load-analysis";
import { exportTables } from "@/lib/domain/analysis/export";
import { MIXED_SHEETS } from "@/lib/domain/analysis/mixed-export";
import { csvFile, tablesXlsx } from "@/lib/domain/spreadsheets/write";
import { defineRoute } from "@/server/http/define-route";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

const paramsSchema = z.object({ trialId: idParam });
const exportSchema = z.object({
  format: z.enum(["xlsx", "csv"], { error: "Ask for format xlsx or csv." }).default("xlsx"),
  table: z
    .enum(["raw", "means", "anova", "emergence", "stability", "mixed-model", "mixed-means", "mixed-pairs"], {
      error: "Ask for table raw, means, anova, emergence, stability, mixed-model, mixed-means or mixed-pairs.",
    })
    .default("means"),
});

function exportQueryOf(search: URLSearchParams) {
  const analysis = parseAnalysisQuery(search);
  if (!analysis.ok) throw new AppError("bad_request", analysis.message);
  const options = exportSchema.safeParse({ format: search.get("format") ?? undefined, table: search.get("table") ?? undefined });
  if (!options.success) throw new AppError("bad_request", options.error.issues[0]!.message);
  return { analysis: analysis.data, options: options.data };
}
const CSV_SHEETS = {
  raw: "Raw data",
  means: "Means",
  anova: "ANOVA",
  emergence: "Emergence",
  stability: "Stability",
  "mixed-model": MIXED_SHEETS.components,
  "mixed-means": MIXED_SHEETS.means,
  "mixed-pairs": MIXED_SHEETS.pairs,
} as const;

/** The analysis as an .xlsx workbook (every table plus settings and a data dictionary) or one table as CSV. */
export const GET = defineRoute(
  { roles: ["coordinator", "admin"], params: { schema: paramsSchema, message: "That trial does not exist." }, query: exportQueryOf },
  async ({ viewer, params, query }) => {
    const loaded = await loadAnalysis(viewer, params.trialId, query.analysis);
    if (!loaded) throw new AppError("not_found", "That trial does not exist or is not in your programs.");
    const { result } = loaded;
    const tables = exportTables(result, new Date().toISOString(), true);
    const base = `${result.trial.code}-${result.trait.code}-analysis`.toLowerCase().replace(/[^a-z0-9-]+/g, "-");
    const headers = { "Cache-Control": "private, no-store" };

    if (query.options.format === "csv") {
      const table = tables.find((t) => t.name === CSV_SHEETS[query.options.table]);
      if (!table) {
        throw new AppError(
          "not_found",
          query.options.table.startsWith("mixed")
            ? "Tick the mixed model on the analysis page (mixed=1) to export its tables."
            : query.options.table === "stability"
              ? `There is no stability table for this trait: ${result.combined?.stabilityProblem ?? result.combinedProblem ?? "it needs a combined analysis of 3 or more sites."}`
              : "This trial has no emergence counts to export.",
        );
      }
      return new Response(csvFile([table.columns, ...table.rows]), {
        headers: { ...headers, "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${base}-${query.options.table}.csv"` },
      });
    }

    return new Response(await tablesXlsx(tables), {
      headers: {
        ...headers,
        "Content-Type": "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
        "Content-Disposition": `attachment; filename="${base}.xlsx"`,
      },
    });
  },
);
