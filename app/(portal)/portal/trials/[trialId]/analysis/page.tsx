import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireUser } from "@/server/auth/guards";
import { idParam } from "@/lib/validation/common";
import { parseAnalysisQuery } from "@/lib/validation/analysis";
import { loadAnalysisView } from "@/server/analysis/load-analysis";
import { listExclusionTargets } from "@/db/queries/analysis";
import { AnalysisQueryProvider } from "@/components/analysis/query-provider";
import { AnalysisView } from "@/components/analysis/analysis-view";

export const metadata: Metadata = { title: "Analysis" };

export default async function AnalysisPage({ params, searchParams }: { params: Promise<{ trialId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  // Cooperators get their own shared sites only (the query layer) and blind codes only until publication (lib/domain/analysis/blind).
  const viewer = await requireUser();
  const trialId = idParam.safeParse((await params).trialId);
  if (!trialId.success) notFound();
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(await searchParams)) if (typeof value === "string") search.set(key, value);
  const query = parseAnalysisQuery(search);
  // A hand-edited address with a bad setting falls back to the defaults and says so, rather than failing.
  const [loaded, targets] = await Promise.all([loadAnalysisView(viewer, trialId.data, query.ok ? query.data : {}), listExclusionTargets(viewer, trialId.data)]);
  if (!loaded) notFound();
  const { view: result } = loaded;
  return (
    <div className="space-y-6">
      {targets && (
        <p className="text-sm">
          <Link href={`/portal/trials/${result.trial.id}`}>← {result.trial.code}</Link>
        </p>
      )}
      <div>
        <h1 className="text-3xl font-bold">Analysis: {result.trial.title}</h1>
        <p className="text-loam-700">
          <span className="font-mono">{result.trial.code}</span> · {result.trial.crop}
        </p>
      </div>
      {!query.ok && (
        <p role="status" className="rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2">
          {query.message} Showing the default settings instead.
        </p>
      )}
      <AnalysisQueryProvider>
        <AnalysisView trialId={result.trial.id} initial={result} targets={targets} />
      </AnalysisQueryProvider>
    </div>
  );
}
