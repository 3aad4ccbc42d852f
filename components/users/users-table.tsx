"use client";
import { useMemo, useState } from "react";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { Badge } from "@/components/ui/badge";
import { InvitationBadge } from "@/components/ui/status-badge";
import { UserRowControls } from "@/components/users/user-role-form";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import { INVITATION_LABELS, type InvitationState } from "@/lib/domain/vocabulary/statuses";
import type { Role } from "@/lib/domain/vocabulary/enums";
import type { ProgramOption } from "@/db/queries/programs";

/** One account as the users page shows it; the page works out the invitation state and the sign-in date. */
export interface UserRow {
  id: number;
  name: string;
  email: string;
  role: Role;
  active: boolean;
  hasPassword: boolean;
  programs: { id: number; name: string }[];
  lastSignIn: string | null;
  invitation: InvitationState | null;
}

/**
 * Every account with its role, programs, last sign-in and invitation, searchable by name or e-mail, and the
 * controls to change it; the admin's own row has none.
 */
export function UsersTable({ users, viewerId, programs }: { users: UserRow[]; viewerId: number; programs: ProgramOption[] }) {
  const [notice, setNotice] = useState<{ ok: boolean; text: string } | null>(null);
  // Stable columns: the table renders each cell function as a component, so a new function on every render
  // would remount the row controls and lose their dialogs.
  const columns = useMemo<ColumnDef<UserRow, unknown>[]>(
    () => [
      {
        id: "name",
        header: "Name",
        accessorFn: (u) => u.name,
        cell: (c) => (
          <span className="font-semibold">
            {c.row.original.name} {!c.row.original.active && <Badge tone="bad">Deactivated</Badge>}
          </span>
        ),
      },
      { id: "email", header: "E-mail", accessorFn: (u) => u.email, meta: { cellClassName: "break-all" } },
      { id: "role", header: "Role", accessorFn: (u) => ROLE_LABELS[u.role], enableGlobalFilter: false },
      {
        id: "programs",
        header: "Programs",
        enableGlobalFilter: false,
        accessorFn: (u) => (u.role === "admin" ? "Every program" : u.role === "coordinator" ? u.programs.map((p) => p.name).join(", ") || "None yet" : "—"),
      },
      { id: "lastSignIn", header: "Last sign-in", enableGlobalFilter: false, accessorFn: (u) => u.lastSignIn ?? "Never" },
      {
        id: "invitation",
        header: "Invitation",
        enableGlobalFilter: false,
        accessorFn: (u) => (u.invitation ? INVITATION_LABELS[u.invitation] : "—"),
        cell: (c) => (c.row.original.invitation ? <InvitationBadge state={c.row.original.invitation} /> : "—"),
      },
      {
        id: "change",
        header: "Change",
        enableSorting: false,
        enableGlobalFilter: false,
        cell: (c) => (c.row.original.id === viewerId ? <span className="text-loam-700">This is you</span> : <UserRowControls user={c.row.original} programs={programs} notify={setNotice} />),
      },
    ],
    [viewerId, programs],
  );
  return (
    <>
      <div role="status" aria-live="polite" className="mb-3 empty:mb-0">
        {notice && (
          <p
            className={
              notice.ok
                ? "rounded-lg border border-sprout-500 bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700"
                : "rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 text-sm font-medium text-beet-700"
            }
          >
            {notice.text}
          </p>
        )}
      </div>
      <DataTable data={users} columns={columns} caption="All Seedplot accounts" filterLabel="Search by name or e-mail" pageSize={null} />
    </>
  );
}
