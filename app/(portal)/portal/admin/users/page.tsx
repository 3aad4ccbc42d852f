import type { Metadata } from "next";
import { requireRole } from "@/server/auth/guards";
import { listUsersForAdmin } from "@/db/queries/users";
import { listProgramOptions } from "@/db/queries/programs";
import { Card } from "@/components/ui/card";
import { UsersTable, type UserRow } from "@/components/users/users-table";
import { InviteStaffForm } from "@/components/users/invite-staff-form";
import { invitationState } from "@/lib/domain/invitations";

export const metadata: Metadata = { title: "Users and roles" };

// Times in UTC with the zone named, so every admin reads the same moment.
const utc = (d: Date | null) => (d ? `${d.toISOString().slice(0, 16).replace("T", " ")} UTC` : null);

export default async function UsersPage() {
  const viewer = await requireRole("admin");
  const [accounts, programs] = await Promise.all([listUsersForAdmin(viewer), listProgramOptions(viewer)]);
  const now = new Date();
  const users: UserRow[] = accounts.map((a) => ({
    id: a.id,
    name: a.name,
    email: a.email,
    role: a.role,
    active: a.active,
    hasPassword: a.hasPassword,
    programs: a.programs,
    lastSignIn: utc(a.lastSignedInAt),
    invitation: invitationState({ hasPassword: a.hasPassword, newest: a.newestInvitation, now }),
  }));
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Users and roles</h1>
        <a href="#invite-staff" className="font-semibold">
          Invite a coordinator or administrator
        </a>
      </div>
      <Card>
        <UsersTable users={users} viewerId={viewer.id} programs={programs} />
      </Card>
      <div id="invite-staff" className="scroll-mt-4">
        <Card title="Invite a coordinator or administrator">
          <p className="mb-3 text-sm text-loam-700">
            They get an e-mail with a link to set their password; it works once, for 7 days. Partner growers are invited from the Growers page, to a site.
          </p>
          <InviteStaffForm programs={programs} />
        </Card>
      </div>
    </div>
  );
}
