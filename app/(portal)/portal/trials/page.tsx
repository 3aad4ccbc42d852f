import type { Metadata } from "next";
import Link from "next/link";
import { requireRole } from "@/server/auth/guards";
import { listTrialsForViewer } from "@/db/queries/overview";
import { Card } from "@/components/ui/card";
import { buttonClasses } from "@/components/ui/button";
import { TrialList } from "@/components/trials/trial-list";

export const metadata: Metadata = { title: "Trials" };

export default async function TrialsPage() {
  const viewer = await requireRole("coordinator", "admin");
  const trials = await listTrialsForViewer(viewer);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Trials</h1>
        <Link href="/portal/trials/new" className={buttonClasses("primary")}>
          New trial
        </Link>
      </div>
      <Card>
        <TrialList rows={trials} />
      </Card>
    </div>
  );
}
