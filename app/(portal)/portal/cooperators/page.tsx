import type { Metadata } from "next";
import { requireRole } from "@/server/auth/guards";
import { listCooperators } from "@/db/queries/users";
import { listSiteOptions } from "@/db/queries/overview";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { InviteForm } from "@/components/users/invite-form";

export const metadata: Metadata = { title: "Partner growers" };

export default async function CooperatorsPage() {
  const viewer = await requireRole("coordinator", "admin");
  const [cooperators, sites] = await Promise.all([listCooperators(viewer), listSiteOptions(viewer)]);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Partner growers</h1>
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr] [&>*]:min-w-0">
        <Card title="Growers in the network">
          <ul className="divide-y divide-husk-100">
            {cooperators.map((c) => (
              <li key={c.id} className="py-2">
                <span className="font-semibold">{c.name}</span> <span className="text-sm text-loam-700">{c.email}</span>
                {c.phone && <span className="text-sm text-loam-700"> · {c.phone}</span>}{" "}
                {c.invited && <Badge tone="warn">Invitation pending</Badge>} {!c.active && <Badge tone="bad">Inactive</Badge>}
                <span className="block text-sm text-loam-700">{c.sites.length ? c.sites.join(", ") : "No site yet"}</span>
              </li>
            ))}
          </ul>
        </Card>
        <Card title="Invite a grower">
          <p className="mb-4 text-sm text-loam-700">They get an e-mail with a link to set their password. The link works once, for 7 days. Someone who already has an account is added to the site and told by e-mail.</p>
          <InviteForm sites={sites} />
        </Card>
      </div>
    </div>
  );
}
