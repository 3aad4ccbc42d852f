import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireRole } from "@/server/auth/guards";
import { idParam } from "@/lib/validation/common";
import { getVarietyHistory } from "@/db/queries/analysis";
import { loadAnalysis } from "@/server/analysis/load-analysis";
import { standingOf, type TrialStanding } from "@/lib/domain/analysis/history";
import { formatNumber } from "@/lib/domain/analysis/format";
import { Card } from "@/components/ui/card";
import { varietyAcrossSeasons } from "@/server/analysis/across-seasons";
import { AcrossSeasonsStanding } from "@/components/analysis/across-seasons-standing";
import { TrialStatusBadge } from "@/components/ui/status-badge";

export const metadata: Metadata = { title: "Variety history" };

const ordinal = (n: number) => `${n}${n % 10 === 1 && n % 100 !== 11 ? "st" : n % 10 === 2 && n % 100 !== 12 ? "nd" : n % 10 === 3 && n % 100 !== 13 ? "rd" : "th"}`;

export default async function VarietyHistoryPage({ params }: { params: Promise<{ varietyId: string }> }) {
  const viewer = await requireRole("coordinator", "admin");
  const varietyId = idParam.safeParse((await params).varietyId);
  if (!varietyId.success) notFound();
  const history = await getVarietyHistory(viewer, varietyId.data);
  if (!history) notFound();
  // Each trial's default analysis (accepted data, sites random), from the same cache as the analysis page.
  const traitCodes = new Set<string>();
  const standings = await Promise.all(
    history.trials.map(async (t): Promise<TrialStanding | null> => {
      try {
        const loaded = await loadAnalysis(viewer, t.trialId, {});
        if (loaded) traitCodes.add(loaded.result.trait.code);
        return loaded ? standingOf(loaded.result, t.entryId) : null;
      } catch {
        return null;
      }
    }),
  );
  // grown in more than one season: every season at once, through the mixed model
  const seasonCount = new Set(history.trials.map((t) => `${t.season} ${t.year}`)).size;
  const acrossSeasons = seasonCount > 1 ? await varietyAcrossSeasons(viewer, { varietyId: history.variety.id, cropId: history.variety.cropId, traitCodes: [...traitCodes] }) : [];
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-3xl font-bold">{history.variety.name}</h1>
        <p className="text-loam-700">{history.variety.crop} · history across trials and seasons</p>
      </div>
      {history.trials.length === 0 && <p>This variety has not been entered in any trial yet.</p>}
      {acrossSeasons.length > 0 && (
        <Card title={`All ${seasonCount} seasons together`} actions={<Link href={`/portal/trials/across-seasons?crop=${history.variety.cropId}&trait=${acrossSeasons[0]!.traitCode}`}>open the across-seasons analysis</Link>}>
          <AcrossSeasonsStanding rows={acrossSeasons} name={history.variety.name} />
        </Card>
      )}
      <ul className="space-y-4">
        {history.trials.map((t, i) => {
          const s = standings[i];
          return (
            <li key={t.trialId}>
              <Card title={`${t.season.includes(String(t.year)) ? t.season : `${t.season} ${t.year}`}: ${t.trialTitle}`} actions={<TrialStatusBadge status={t.status} />}>
                <p className="text-sm text-loam-700">
                  <span className="font-mono">{t.trialCode}</span> · entered as <span className="font-mono">{t.blindCode}</span>
                  {t.isCheck ? " (check)" : ""} · {t.entries} entries · {t.sites} sites ·{" "}
                  <Link href={`/portal/trials/${t.trialId}/analysis`}>open the analysis</Link>
                </p>
                {!s || s.problem ? (
                  <p className="mt-2">{s?.problem ?? "No accepted data to rank yet."}</p>
                ) : (
                  <div className="mt-2 space-y-1">
                    <p>
                      <strong>{s.rank !== null ? `Ranked ${ordinal(s.rank)} of ${s.of}` : `One of ${s.of} entries`}</strong> on {s.trait}
                      {s.rank === null ? " (no better direction set, so not ranked)" : ""}: {formatNumber(s.mean)} ({formatNumber(s.percentOfTrialMean, 0)}% of the trial mean
                      {s.percentOfCheck !== null ? `, ${formatNumber(s.percentOfCheck, 0)}% of the check${s.beyondLsd === null ? "" : s.beyondLsd ? ", a difference larger than the LSD" : ", within the LSD of the check"}` : ""})
                      {s.letter ? `, group ${s.letter}` : ""}.
                    </p>
                    {s.topAt !== null && (
                      <p className="text-sm">
                        Ranked first ({s.topWord}) at {s.topAt} of {s.sitesAnalysed} analysed sites. Site ranks: {s.siteRanks.map((r) => `${r.siteName} ${r.rank !== null ? ordinal(r.rank) : "–"}`).join(", ")}.
                      </p>
                    )}
                  </div>
                )}
              </Card>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
