import type { Metadata } from "next";
import { publishBlockReason } from "@/lib/domain/design/status";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { requireRole } from "@/server/auth/guards";
import { getPublishContext, listReportVersions } from "@/db/queries/publish";
import { listAnalysisTraits } from "@/db/queries/analysis";
import { isPublishableTrait } from "@/lib/domain/vocabulary/traits";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { PublishForm, SiteInclusionList, UnpublishForm } from "@/components/publish/publish-forms";
import { readSiteInclusion } from "@/server/publish/publish";
import { inclusionWords } from "@/lib/domain/publish/site-inclusion";
import { INCLUSION_TONES } from "@/lib/domain/vocabulary/statuses";
import { formatDate } from "@/lib/domain/vocabulary/labels";

export const metadata: Metadata = { title: "Publish results" };

export default async function PublishPage({ params }: { params: Promise<{ trialId: string }> }) {
  const viewer = await requireRole("coordinator", "admin");
  const id = z.coerce.number().int().positive().safeParse((await params).trialId);
  if (!id.success) notFound();
  const [context, versions, traits, inclusion] = await Promise.all([
    getPublishContext(viewer, id.data),
    listReportVersions(viewer, id.data),
    listAnalysisTraits(viewer, id.data),
    readSiteInclusion(viewer, id.data),
  ]);
  if (!context || !traits || !inclusion) notFound();
  const siteRows = inclusion.map((s) => ({ siteId: s.siteId, siteName: s.siteName, included: s.included, words: inclusionWords(s), tone: INCLUSION_TONES[s.reason] }));
  const leftOut = inclusion.filter((s) => !s.included).map((s) => ({ siteId: s.siteId, siteName: s.siteName }));
  const { trial } = context;
  const live = versions.filter((v) => v.unpublishedAt === null);
  const nextVersion = (versions[0]?.version ?? 0) + 1;
  return (
    <div className="space-y-6">
      <p className="text-sm"><Link href={`/portal/trials/${trial.id}`}>← {trial.title}</Link></p>
      <h1 className="text-3xl font-bold">Publish results: {trial.title}</h1>
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr] [&>*]:min-w-0">
        <div className="space-y-6">
          <Card title="Sites in the next version">
            <SiteInclusionList sites={siteRows} />
          </Card>
          <Card title="Publish a new version">
            {publishBlockReason(trial.status) ? (
              <p>{publishBlockReason(trial.status)}</p>
            ) : (
              <PublishForm
                trialId={trial.id}
                traits={traits.filter((t) => isPublishableTrait(t) && t.recorded > 0).map((t) => ({ id: t.id, name: t.name }))}
                nextVersion={nextVersion}
                leftOut={leftOut}
              />
            )}
          </Card>
        </div>
        <div className="space-y-6">
          <Card title="Versions">
            {versions.length === 0 ? (
              <p className="text-loam-700">Not published yet.</p>
            ) : (
              <ul className="space-y-3">
                {versions.map((v) => (
                  <li key={v.id}>
                    <span className="font-semibold">Version {v.version}</span> · {formatDate(v.publishedAt)} by {v.publishedBy ?? "—"}{" "}
                    {v.unpublishedAt ? <Badge tone="bad">Withdrawn</Badge> : <Badge tone="good">Public</Badge>}
                    {v.changeNote && <span className="block text-sm text-loam-700">{v.changeNote}</span>}
                    {v.unpublishReason && <span className="block text-sm text-beet-700">Withdrawn: {v.unpublishReason}</span>}
                  </li>
                ))}
              </ul>
            )}
            {live.length > 0 && (
              <p className="mt-4"><Link href={`/results/${trial.code}`}>Open the public page</Link></p>
            )}
          </Card>
          {versions.length > 0 && (
            <Card title="Withdraw">
              <UnpublishForm trialId={trial.id} live={live.length > 0} />
            </Card>
          )}
        </div>
      </div>
    </div>
  );
}
