"use client";
import { useActionState, useState } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { inviteStaffMember } from "@/server/actions/users";
import type { ProgramOption } from "@/db/queries/programs";

/** An administrator invites a coordinator (of the programs ticked) or another administrator by e-mail. */
export function InviteStaffForm({ programs }: { programs: ProgramOption[] }) {
  const [state, action] = useActionState(inviteStaffMember, null);
  const failed = state && !state.ok ? state : null;
  const [role, setRole] = useState(failed?.values?.role ?? "coordinator");
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={state?.ok ? `sent-${state.message}` : "editing"}>
      <TextField id="staff-name" label="Name" name="name" autoComplete="off" defaultValue={failed?.values?.name} errors={failed?.fieldErrors?.name} />
      <TextField id="staff-email" label="E-mail" name="email" type="email" autoComplete="off" defaultValue={failed?.values?.email} errors={failed?.fieldErrors?.email} />
      <SelectField id="staff-role" label="Role" name="role" value={role} onChange={(e) => setRole(e.target.value)} errors={failed?.fieldErrors?.role}>
        <option value="coordinator">Coordinator (runs the programs ticked below)</option>
        <option value="admin">Administrator (every program, and all accounts)</option>
      </SelectField>
      {role === "coordinator" ? (
        <fieldset className="space-y-1 sm:col-span-2" aria-describedby={failed?.fieldErrors?.programIds ? "staff-programs-error" : undefined}>
          <legend className="mb-1 text-sm font-semibold">Programs</legend>
          {programs.map((p) => (
            <label key={p.id} className="flex min-h-11 items-center gap-2">
              <input type="checkbox" name={`program_${p.id}`} defaultChecked={failed ? failed.values?.[`program_${p.id}`] === "on" : programs.length === 1} className="size-5 accent-sprout-600" />
              {p.name}
            </label>
          ))}
          {failed?.fieldErrors?.programIds && (
            <p id="staff-programs-error" className="text-sm font-medium text-beet-700">
              {failed.fieldErrors.programIds.join(" ")}
            </p>
          )}
        </fieldset>
      ) : (
        <p className="text-sm text-loam-700 sm:col-span-2">An administrator reaches every program and manages all accounts, this page included.</p>
      )}
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton pendingText="Sending…">Send invitation</SubmitButton>
      </div>
    </form>
  );
}
