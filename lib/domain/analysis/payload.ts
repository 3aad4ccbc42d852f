import type { AnalysisPayload, AnalysisResult } from "./types";

/** The result as the page and the JSON API send it; `withPlots` keeps the plot rows for tools that ask for them. */
export function toAnalysisPayload(result: AnalysisResult, withPlots = false): AnalysisPayload {
  if (withPlots) return result;
  const view: AnalysisPayload = { ...result };
  delete view.plots;
  return view;
}
