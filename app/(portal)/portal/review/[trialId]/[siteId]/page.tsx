import Link from "next/link";
import { notFound } from "next/navigation";
import { requireRole } from "@/server/auth/guards";
import { getReviewSheet } from "@/server/review/sheets";
import { idParam } from "@/lib/validation/common";
import { Card } from "@/components/ui/card";
import { DuePanel, SiteHeader } from "@/components/record/site-panels";
import { CommentList, ReviewValues } from "@/components/review/review-table";
import { AcceptForm, CommentForm, ReturnForm } from "@/components/review/review-forms";

export const dynamic = "force-dynamic";

export default async function ReviewSitePage({ params, searchParams }: { params: Promise<{ trialId: string; siteId: string }>; searchParams: Promise<{ plot?: string; key?: string }> }) {
  const viewer = await requireRole("coordinator", "admin");
  const p = await params;
  const trialId = idParam.safeParse(p.trialId);
  const siteId = idParam.safeParse(p.siteId);
  if (!trialId.success || !siteId.success) notFound();
  const sheet = await getReviewSheet(viewer, { trialId: trialId.data, siteId: siteId.data });
  if (!sheet) notFound();
  const sp = await searchParams;
  const initialPlot = idParam.safeParse(sp.plot);
  const site = { trialId: sheet.enrolment.trialId, siteId: sheet.enrolment.siteId };
  const status = sheet.submission?.status ?? "draft";
  return (
    <div className="space-y-6">
      <SiteHeader sheet={sheet} />
      <p className="text-sm text-loam-700">
        {sheet.completeness.recorded} of {sheet.completeness.expected} expected values recorded ·{" "}
        <Link href={`/portal/record/${site.trialId}/${site.siteId}`}>Open the entry form</Link> ·{" "}
        <a href={`/api/record/${site.trialId}/${site.siteId}/export`}>Download as CSV</a>
      </p>
      <DuePanel sheet={sheet} />
      <Card title="Values">
        <ReviewValues sheet={sheet} />
      </Card>
      <div className="grid gap-6 md:grid-cols-2">
        <Card title="Comment on a value" className="scroll-mt-4">
          <div id="comment" />
          <CommentForm
            site={site}
            plots={sheet.plots}
            columns={sheet.columns.map((c) => ({ key: c.key, name: c.name }))}
            initialPlot={initialPlot.success ? initialPlot.data : undefined}
            initialKey={sheet.columns.some((c) => c.key === sp.key) ? sp.key : undefined}
          />
        </Card>
        <Card title="Decision">
          {status === "submitted" ? (
            <div className="space-y-6">
              <AcceptForm site={site} />
              <ReturnForm site={site} />
            </div>
          ) : (
            <p className="text-loam-700">
              {status === "accepted" ? "This data has been accepted." : status === "returned" ? "Returned to the grower; waiting for them to send it again." : "The grower has not sent this data for review yet."}
            </p>
          )}
        </Card>
      </div>
      <Card title="Comments">
        <CommentList sheet={sheet} />
      </Card>
      {sheet.recentChanges.length > 0 && (
        <Card title="Recent corrections">
          <ul className="space-y-1 text-sm">
            {sheet.recentChanges.map((c, i) => (
              <li key={i}>
                {c.plotCode} {c.column}: {c.from} → <span className="font-semibold">{c.to}</span>{" "}
                <span className="text-loam-700">
                  by {c.by}, {c.when}
                  {c.fromUpload ? " (upload)" : ""}
                </span>
              </li>
            ))}
          </ul>
        </Card>
      )}
    </div>
  );
}
