import type { Metadata } from "next";
import Link from "next/link";
import { requireRole } from "@/server/auth/guards";
import { listTrialsForViewer } from "@/db/queries/overview";
import { listSeasonsForStaff } from "@/db/queries/seasons";
import { Card } from "@/components/ui/card";
import { buttonClasses } from "@/components/ui/button";
import { TrialList } from "@/components/trials/trial-list";
import { SeasonFilter } from "@/components/trials/season-filter";
import { idParam } from "@/lib/validation/common";

export const metadata: Metadata = { title: "Trials" };

export default async function TrialsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const viewer = await requireRole("coordinator", "admin");
  const { season: seasonParam } = await searchParams;
  const seasons = await listSeasonsForStaff(viewer);
  const parsed = idParam.safeParse(Array.isArray(seasonParam) ? seasonParam[0] : seasonParam);
  // Only a season of the viewer's programs filters; anything else shows every season, and says so.
  const season = parsed.success ? seasons.find((s) => s.id === parsed.data) : undefined;
  const unknownSeason = seasonParam !== undefined && seasonParam !== "" && !season;
  const trials = await listTrialsForViewer(viewer, { seasonId: season?.id });
  const showProgram = new Set(seasons.map((s) => s.programId)).size > 1;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Trials</h1>
        <div className="flex flex-wrap gap-2">
          <Link href="/portal/trials/across-seasons" className={buttonClasses("secondary")}>
            Across seasons
          </Link>
          <Link href="/portal/trials/new" className={buttonClasses("primary")}>
            New trial
          </Link>
        </div>
      </div>
      <Card>
        <SeasonFilter seasons={seasons.map((s) => ({ id: s.id, label: showProgram ? `${s.name} · ${s.program}` : s.name, closed: s.closed }))} selected={season?.id} />
        <p className="mb-3 mt-4 text-loam-700" data-testid="season-shown">
          {season ? (
            <>
              Showing the trials of <strong className="text-loam-900">{season.name}</strong>
              {showProgram ? ` (${season.program})` : ""}
              {season.closed ? ", a closed season" : ""}. <Link href="/portal/trials">Show every season</Link>
            </>
          ) : (
            <>Showing the trials of every season{unknownSeason ? " (the season asked for is not one of your programs' seasons)" : ""}.</>
          )}
        </p>
        <TrialList rows={trials} empty={season ? `No trials in ${season.name} yet.` : undefined} />
      </Card>
    </div>
  );
}
