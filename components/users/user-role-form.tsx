"use client";
import { useActionState } from "react";
import { changeUserRole, setUserActive } from "@/server/actions/users";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import { ROLES, type Role } from "@/lib/domain/vocabulary/enums";

/** Inline controls on one user row: change the role, or deactivate/reactivate the account. */
export function UserRowControls({ userId, role, active, name }: { userId: number; role: Role; active: boolean; name: string }) {
  const [roleState, roleAction, rolePending] = useActionState(changeUserRole, null);
  const [activeState, activeAction, activePending] = useActionState(setUserActive, null);
  const message = [roleState, activeState].find((s) => s !== null);
  return (
    <div className="flex flex-wrap items-center gap-2">
      <form action={roleAction} className="flex flex-wrap items-center gap-2">
        <input type="hidden" name="userId" value={userId} />
        <label className="sr-only" htmlFor={`role-${userId}`}>Role of {name}</label>
        <select id={`role-${userId}`} name="role" defaultValue={role} className="min-h-11 rounded-lg border border-loam-300 bg-white px-2">
          {ROLES.map((r) => (
            <option key={r} value={r}>{ROLE_LABELS[r]}</option>
          ))}
        </select>
        <button type="submit" disabled={rolePending} className="min-h-11 rounded-lg border border-loam-300 px-3 font-semibold hover:bg-husk-100">Save role</button>
      </form>
      <form action={activeAction}>
        <input type="hidden" name="userId" value={userId} />
        <input type="hidden" name="active" value={active ? "false" : "true"} />
        <button type="submit" disabled={activePending} className="min-h-11 rounded-lg px-3 font-semibold text-beet-700 hover:bg-beet-50">
          {active ? "Deactivate" : "Reactivate"}
        </button>
      </form>
      <span aria-live="polite" className="text-sm">
        {message && (message.ok ? <span className="text-sprout-700">{message.message}</span> : <span className="text-beet-700">{message.formError}</span>)}
      </span>
    </div>
  );
}
