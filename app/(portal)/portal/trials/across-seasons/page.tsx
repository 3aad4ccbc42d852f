import type { Metadata } from "next";
import Link from "next/link";
import { requireRole } from "@/server/auth/guards";
import { loadAcrossSeasons } from "@/server/analysis/across-seasons";
import { acrossSeasonsQuerySchema } from "@/lib/validation/analysis";
import { orderWords } from "@/lib/domain/analysis/ranking";
import { unitHeading } from "@/lib/domain/analysis/format";
import { Card } from "@/components/ui/card";
import { buttonClasses } from "@/components/ui/button";
import { TrialStatusBadge } from "@/components/ui/status-badge";
import { AcrossSeasonsResults } from "@/components/analysis/across-seasons-results";

export const metadata: Metadata = { title: "Across seasons" };

const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

export default async function AcrossSeasonsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const viewer = await requireRole("coordinator", "admin");
  const raw = await searchParams;
  const parsed = acrossSeasonsQuerySchema.safeParse({ crop: first(raw.crop) || undefined, trait: first(raw.trait) || undefined });
  const query = parsed.success ? parsed.data : {};
  const view = (await loadAcrossSeasons(viewer, { cropId: query.crop, traitCode: query.trait }))!;
  const { outcome, trait } = view;
  const download = view.crop && trait ? `/api/trials/across-seasons/export?${new URLSearchParams({ crop: String(view.crop.id), trait: trait.code })}` : "";
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/portal/trials">← Trials</Link>
      </p>
      <div>
        <h1 className="text-3xl font-bold">Across seasons</h1>
        <p className="text-loam-700">
          Every season of a crop&apos;s trials in one analysis: each site in each season counts as one site-year, and a variety is compared through the
          seasons it was grown in, even when it entered or left the trials along the way.
        </p>
      </div>
      {!parsed.success && (
        <p role="status" className="rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2">
          {parsed.error.issues[0]?.message ?? "That address has a setting Seedplot does not know."} Choose the crop and trait again.
        </p>
      )}
      <Card title="What to analyse">
        <form method="get" className="flex flex-wrap items-end gap-4">
          <div className="space-y-1">
            <label htmlFor="crop" className="block text-sm font-semibold">
              Crop
            </label>
            <select id="crop" name="crop" defaultValue={view.crop?.id ?? ""} className="block min-h-11 rounded-lg border border-loam-300 bg-white px-3 text-base">
              <option value="">Choose a crop</option>
              {view.crops.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                </option>
              ))}
            </select>
          </div>
          {view.crop && (
            <div className="space-y-1">
              <label htmlFor="trait" className="block text-sm font-semibold">
                Trait
              </label>
              <select id="trait" name="trait" defaultValue={trait?.code ?? ""} className="block min-h-11 rounded-lg border border-loam-300 bg-white px-3 text-base">
                <option value="">Choose a trait</option>
                {view.traits.map((t) => (
                  <option key={t.code} value={t.code}>
                    {t.name}
                  </option>
                ))}
              </select>
            </div>
          )}
          <button type="submit" className={buttonClasses("primary")}>
            {view.crop ? "Analyse" : "Next"}
          </button>
        </form>
        {view.crops.length === 0 && <p className="mt-3">Your programs have no trials yet.</p>}
      </Card>

      {view.crop && trait && (
        <Card
          title={`${trait.name}: ${view.crop.name}, every season`}
          actions={
            <div className="flex flex-wrap gap-2">
              <a className={buttonClasses("secondary")} href={`${download}&format=xlsx`}>
                Download .xlsx
              </a>
              {outcome?.mixed && (
                <a className={buttonClasses("secondary")} href={`${download}&format=csv&table=means`}>
                  Download means CSV
                </a>
              )}
              <a className={buttonClasses("secondary")} href={`${download}&format=csv&table=trials`}>
                Download trials CSV
              </a>
            </div>
          }
        >
          {outcome?.mixed && outcome.trait ? (
            <AcrossSeasonsResults
              mixed={outcome.mixed}
              trait={outcome.trait}
              unit={unitHeading(outcome.trait) ?? ""}
              order={orderWords(outcome.trait)}
            />
          ) : (
            <p>{outcome?.mixedProblem ?? "No trial of this crop has data for this trait yet."}</p>
          )}
        </Card>
      )}

      {view.crop && view.trials.length > 0 && (
        <Card title={`${view.crop.name} trials in your programs`}>
          <ul className="space-y-1">
            {view.trials.map((t) => (
              <li key={t.id} className="flex flex-wrap items-center gap-2">
                <Link href={`/portal/trials/${t.id}/analysis`}>
                  <span className="font-mono">{t.code}</span> {t.title}
                </Link>
                <span className="text-sm text-loam-700">{t.season.includes(String(t.year)) ? t.season : `${t.season} ${t.year}`}</span>
                <TrialStatusBadge status={t.status} />
                {trait && <span className="text-sm text-loam-700">{t.used ? "in the analysis" : "no accepted data for this trait"}</span>}
              </li>
            ))}
          </ul>
        </Card>
      )}
    </div>
  );
}
