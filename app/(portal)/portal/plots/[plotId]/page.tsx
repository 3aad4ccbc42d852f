import { notFound, redirect } from "next/navigation";
import { requireUser } from "@/server/auth/guards";
import { getPlotRecordTarget } from "@/db/queries/observations";
import { idParam } from "@/lib/validation/common";

export const dynamic = "force-dynamic";

// Plot labels carry a QR code of this address; it opens the site's entry page on that one plot.
export default async function PlotPage({ params }: { params: Promise<{ plotId: string }> }) {
  const viewer = await requireUser();
  const parsed = idParam.safeParse((await params).plotId);
  if (!parsed.success) notFound();
  const target = await getPlotRecordTarget(viewer, parsed.data);
  if (!target) notFound();
  redirect(`/portal/record/${target.trialId}/${target.siteId}?plot=${target.plotId}`);
}
