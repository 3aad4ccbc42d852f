import type { Metadata } from "next";
import { requireRole } from "@/server/auth/guards";
import { listUsersForAdmin } from "@/db/queries/users";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { UserRowControls } from "@/components/users/user-role-form";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";

export const metadata: Metadata = { title: "Users and roles" };

export default async function UsersPage() {
  const viewer = await requireRole("admin");
  const users = await listUsersForAdmin(viewer);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Users and roles</h1>
      <Card>
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">All Seedplot accounts</caption>
            <thead className="border-b border-husk-200 text-loam-700">
              <tr>
                <th scope="col" className="py-2 pr-3">Name</th>
                <th scope="col" className="py-2 pr-3">E-mail</th>
                <th scope="col" className="py-2 pr-3">Role</th>
                <th scope="col" className="py-2">Change</th>
              </tr>
            </thead>
            <tbody>
              {users.map((u) => (
                <tr key={u.id} className="border-b border-husk-100 align-top">
                  <td className="py-2 pr-3 font-semibold">
                    {u.name} {!u.active && <Badge tone="bad">Inactive</Badge>} {u.invited && <Badge>Invited</Badge>}
                  </td>
                  <td className="py-2 pr-3">{u.email}</td>
                  <td className="py-2 pr-3">{ROLE_LABELS[u.role]}</td>
                  <td className="py-2">{u.id === viewer.id ? <span className="text-loam-700">This is you</span> : <UserRowControls userId={u.id} role={u.role} active={u.active} name={u.name} />}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
    </div>
  );
}
