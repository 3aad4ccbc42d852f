import type { Metadata } from "next";
import { requireRole } from "@/server/auth/guards";
import { listSitesForStaff } from "@/db/queries/sites";
import { listProgramOptions } from "@/db/queries/programs";
import { Card } from "@/components/ui/card";
import { SiteTable } from "@/components/sites/site-table";
import { SiteForm } from "@/components/sites/site-form";

export const metadata: Metadata = { title: "Sites" };

export default async function SitesPage() {
  const viewer = await requireRole("coordinator", "admin");
  const [sites, programs] = await Promise.all([listSitesForStaff(viewer), listProgramOptions(viewer)]);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Partner sites</h1>
      <Card>
        <SiteTable rows={sites} />
      </Card>
      <Card title="Add a site">
        <SiteForm programs={programs} />
      </Card>
    </div>
  );
}
