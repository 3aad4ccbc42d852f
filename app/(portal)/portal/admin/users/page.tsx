import type { Metadata } from "next";
import { requireRole } from "@/server/auth/guards";
import { listUsersForAdmin } from "@/db/queries/users";
import { Card } from "@/components/ui/card";
import { UsersTable } from "@/components/users/users-table";

export const metadata: Metadata = { title: "Users and roles" };

export default async function UsersPage() {
  const viewer = await requireRole("admin");
  const users = await listUsersForAdmin(viewer);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Users and roles</h1>
      <Card>
        <UsersTable users={users} viewerId={viewer.id} />
      </Card>
    </div>
  );
}
