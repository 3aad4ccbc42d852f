"use client";
import { useMemo } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { Badge } from "@/components/ui/badge";
import { UserRowControls } from "@/components/users/user-role-form";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import type { listUsersForAdmin } from "@/db/queries/users";

type UserRow = Awaited<ReturnType<typeof listUsersForAdmin>>[number];

/** Every account with its role and the controls to change it; the admin's own row has none. */
export function UsersTable({ users, viewerId }: { users: UserRow[]; viewerId: number }) {
  // Stable columns: the table renders each cell function as a component, so a new function on every render
  // would remount the row controls and lose the message of the change just made.
  const columns = useMemo<ColumnDef<UserRow, unknown>[]>(() => [
    {
      id: "name",
      header: "Name",
      accessorFn: (u) => u.name,
      cell: (c) => (
        <span className="font-semibold">
          {c.row.original.name} {!c.row.original.active && <Badge tone="bad">Inactive</Badge>} {c.row.original.invited && <Badge>Invited</Badge>}
        </span>
      ),
    },
    { id: "email", header: "E-mail", accessorFn: (u) => u.email },
    { id: "role", header: "Role", accessorFn: (u) => ROLE_LABELS[u.role] },
    {
      id: "change",
      header: "Change",
      enableSorting: false,
      enableGlobalFilter: false,
      cell: (c) => (c.row.original.id === viewerId ? <span className="text-loam-700">This is you</span> : <UserRowControls userId={c.row.original.id} role={c.row.original.role} active={c.row.original.active} name={c.row.original.name} />),
    },
  ], [viewerId]);
  // Every account on one page: an admin looks for a person by name or e-mail with the filter.
  return <DataTable data={users} columns={columns} caption="All Seedplot accounts" filterLabel="Filter accounts" pageSize={null} />;
}
