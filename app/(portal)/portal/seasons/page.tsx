import type { Metadata } from "next";
import { requireRole } from "@/server/auth/guards";
import { listSeasonsForStaff } from "@/db/queries/seasons";
import { listProgramOptions } from "@/db/queries/programs";
import { Card } from "@/components/ui/card";
import { SeasonTable } from "@/components/seasons/season-table";
import { NewSeasonForm } from "@/components/seasons/season-forms";

export const metadata: Metadata = { title: "Seasons" };

export default async function SeasonsPage() {
  const viewer = await requireRole("coordinator", "admin");
  const [seasons, programs] = await Promise.all([listSeasonsForStaff(viewer), listProgramOptions(viewer)]);
  return (
    <div className="space-y-6">
      <div className="space-y-2">
        <h1 className="text-3xl font-bold">Seasons</h1>
        <p className="max-w-3xl text-loam-700">
          Every trial runs in one season of its program. New trials can be set up only in an open season; close a season once its
          trials are set up, and they carry on as before.
        </p>
      </div>
      {programs.length === 0 ? (
        <Card>
          <p>You do not coordinate a program yet. Ask an administrator to add you to one.</p>
        </Card>
      ) : (
        <>
          <Card>
            <SeasonTable rows={seasons} showProgram={programs.length > 1} />
          </Card>
          <Card title="Add a season">
            <NewSeasonForm programs={programs} />
          </Card>
        </>
      )}
    </div>
  );
}
