"use client";
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { ConfirmAction } from "@/components/ui/confirm-action";
import { FormMessage } from "@/components/ui/form-message";
import { SubmitButton } from "@/components/ui/submit-button";
import { cancelUserInvitation, changeUserRole, resendUserInvitation, setCoordinatorPrograms, setUserActive } from "@/server/actions/users";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import { ROLES } from "@/lib/domain/vocabulary/enums";
import type { ActionResult } from "@/lib/validation/action-result";
import type { ProgramOption } from "@/db/queries/programs";
import type { UserRow } from "@/components/users/users-table";

type Notify = (notice: { ok: boolean; text: string }) => void;
type FormAction = (previous: ActionResult | null, formData: FormData) => Promise<ActionResult>;

/** Wraps an action so its outcome goes to the table's notice. */
function useNotifyingAction(action: FormAction, notify: Notify, fallback: string) {
  return useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await action(previous, formData);
    notify(result.ok ? { ok: true, text: result.message ?? fallback } : { ok: false, text: result.formError ?? "That did not work. Please try again." });
    return result;
  }, null);
}

const noticeOf = (notify: Notify) => (r: ActionResult) => notify(r.ok ? { ok: true, text: r.message ?? "Saved." } : { ok: false, text: r.formError ?? "That did not work." });

/** Ticks the programs a coordinator runs (inside its dialog). */
function ProgramsForm({ user, programs, onSaved }: { user: UserRow; programs: ProgramOption[]; onSaved: (message: string) => void }) {
  const [state, action] = useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await setCoordinatorPrograms(previous, formData);
    if (result.ok) onSaved(result.message ?? "Programs saved.");
    return result;
  }, null);
  const mine = new Set(user.programs.map((p) => p.id));
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="userId" value={user.id} />
      <fieldset className="space-y-2">
        <legend className="mb-1 text-sm font-semibold">Programs {user.name} coordinates</legend>
        {programs.map((p) => (
          <label key={p.id} className="flex min-h-11 items-center gap-2">
            <input type="checkbox" name={`program_${p.id}`} defaultChecked={mine.has(p.id)} className="size-5 accent-sprout-600" />
            {p.name}
          </label>
        ))}
      </fieldset>
      <p className="text-sm text-loam-700">A coordinator sees and changes only the trials, sites and varieties of the programs ticked here.</p>
      <FormMessage state={state} />
      <SubmitButton>Save programs</SubmitButton>
    </form>
  );
}

/** Controls on one account's row: role, programs, invitation (resend, cancel), deactivate or reactivate. */
export function UserRowControls({ user, programs, notify }: { user: UserRow; programs: ProgramOption[]; notify: Notify }) {
  const [, roleAction, rolePending] = useNotifyingAction(changeUserRole, notify, "Role updated.");
  const [, resendAction, resendPending] = useNotifyingAction(resendUserInvitation, notify, "Invitation sent.");
  const [editingPrograms, setEditingPrograms] = useState(false);
  const invitationOpen = !user.hasPassword && user.active;
  return (
    <div className="flex flex-wrap items-center gap-2">
      <form action={roleAction} className="flex flex-wrap items-center gap-2">
        <input type="hidden" name="userId" value={user.id} />
        <label className="sr-only" htmlFor={`role-${user.id}`}>
          Role of {user.name}
        </label>
        <select id={`role-${user.id}`} name="role" defaultValue={user.role} className="min-h-11 rounded-lg border border-loam-300 bg-white px-2">
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </select>
        <Button type="submit" variant="secondary" disabled={rolePending}>
          Save role<span className="sr-only"> of {user.name}</span>
        </Button>
      </form>
      {user.role === "coordinator" && (
        <Button type="button" variant="ghost" onClick={() => setEditingPrograms(true)}>
          Programs<span className="sr-only"> of {user.name}</span>
        </Button>
      )}
      {invitationOpen && (
        <form action={resendAction}>
          <input type="hidden" name="userId" value={user.id} />
          <Button type="submit" variant="ghost" disabled={resendPending}>
            Resend invitation<span className="sr-only"> to {user.name}</span>
          </Button>
        </form>
      )}
      {invitationOpen && user.invitation === "pending" && (
        <ConfirmAction
          label="Cancel invitation"
          srLabel={`of ${user.name}`}
          title={`Cancel ${user.name}'s invitation?`}
          confirmLabel="Cancel invitation"
          action={cancelUserInvitation}
          fields={{ userId: user.id }}
          onDone={noticeOf(notify)}
        >
          <p>The link sent to {user.email} stops working. You can send a new one later with Resend invitation.</p>
        </ConfirmAction>
      )}
      {user.active ? (
        <ConfirmAction
          label="Deactivate"
          srLabel={user.name}
          title={`Deactivate ${user.name}?`}
          confirmLabel="Deactivate account"
          action={setUserActive}
          fields={{ userId: user.id, active: "false" }}
          onDone={noticeOf(notify)}
        >
          <p>{user.name} is signed out everywhere and can no longer sign in. Their records, sites and trials stay as they are.</p>
          <p>If they try to sign in, they are told the account is deactivated and to ask you. You can reactivate it later.</p>
        </ConfirmAction>
      ) : (
        <ConfirmAction
          label="Reactivate"
          srLabel={user.name}
          title={`Reactivate ${user.name}?`}
          confirmLabel="Reactivate account"
          confirmVariant="primary"
          action={setUserActive}
          fields={{ userId: user.id, active: "true" }}
          onDone={noticeOf(notify)}
        >
          <p>{user.name} can sign in again with their password.</p>
        </ConfirmAction>
      )}
      {editingPrograms && (
        <Dialog title={`Programs of ${user.name}`} onClose={() => setEditingPrograms(false)}>
          <ProgramsForm
            user={user}
            programs={programs}
            onSaved={(message) => {
              setEditingPrograms(false);
              notify({ ok: true, text: message });
            }}
          />
        </Dialog>
      )}
    </div>
  );
}
