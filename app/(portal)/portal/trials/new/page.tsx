import type { Metadata } from "next";
import Link from "next/link";
import { requireRole } from "@/server/auth/guards";
import { getTrialFormOptions } from "@/db/queries/trials";
import { Card } from "@/components/ui/card";
import { TrialForm } from "@/components/trials/trial-form";

export const metadata: Metadata = { title: "New trial" };

export default async function NewTrialPage() {
  const viewer = await requireRole("coordinator", "admin");
  const options = (await getTrialFormOptions(viewer))!;
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/portal/trials">← Trials</Link>
      </p>
      <h1 className="text-3xl font-bold">New trial</h1>
      <p className="text-loam-700">The trial starts as a draft. Add entries and enrol sites next; plots are laid out per site once entries are final.</p>
      {options.seasons.length === 0 ? (
        <Card>
          <p>
            None of your programs has an open season. Add one on the <Link href="/portal/seasons">Seasons</Link> page (if you coordinate no program yet,
            ask an administrator to add you to one).
          </p>
        </Card>
      ) : (
        <Card>
          <TrialForm options={options} />
        </Card>
      )}
    </div>
  );
}
