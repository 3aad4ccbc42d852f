import { requireRole } from "@/server/auth/guards";
import { listReviewQueue } from "@/server/review/sheets";
import { ReviewQueue } from "@/components/review/review-table";
import { Card } from "@/components/ui/card";

export const dynamic = "force-dynamic";

export default async function ReviewIndexPage() {
  const viewer = await requireRole("coordinator", "admin");
  const rows = await listReviewQueue(viewer);
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-bold text-loam-900">Review site data</h1>
        <p className="text-loam-700">Data sent for review comes first. Completeness counts the values expected by today.</p>
      </div>
      <Card>
        <ReviewQueue rows={rows} />
      </Card>
    </div>
  );
}
