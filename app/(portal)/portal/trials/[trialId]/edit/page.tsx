import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireRole } from "@/server/auth/guards";
import { getTrialDetail, getTrialFormOptions } from "@/db/queries/trials";
import { idParam } from "@/lib/validation/common";
import { Card } from "@/components/ui/card";
import { TrialForm } from "@/components/trials/trial-form";
import { designLockReason } from "@/lib/domain/design/status";

export const metadata: Metadata = { title: "Edit trial" };

export default async function EditTrialPage({ params }: { params: Promise<{ trialId: string }> }) {
  const viewer = await requireRole("coordinator", "admin");
  const trialId = idParam.safeParse((await params).trialId);
  if (!trialId.success) notFound();
  const [detail, options] = await Promise.all([getTrialDetail(viewer, trialId.data), getTrialFormOptions(viewer)]);
  if (!detail || !options) notFound();
  const { trial, traits, progress } = detail;
  const lock = designLockReason({ status: trial.status, ...progress });
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href={`/portal/trials/${trial.id}`}>← {trial.title}</Link>
      </p>
      <h1 className="text-3xl font-bold">Edit trial details</h1>
      {lock && <p className="rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-sm">{lock} Titles, purpose and protocol notes can still change.</p>}
      <Card>
        <TrialForm
          options={options}
          trial={{ ...trial, traitIds: traits.map((t) => t.id) }}
        />
      </Card>
    </div>
  );
}
