"use client";
import { useActionState } from "react";
import { TextField, SelectField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { inviteCooperator } from "@/server/actions/users";

export function InviteForm({ sites }: { sites: { id: number; name: string }[] }) {
  const [state, action] = useActionState(inviteCooperator, null);
  const failed = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-4" key={state?.ok ? "sent" : "editing"}>
      <TextField label="Grower's name" name="name" autoComplete="off" required defaultValue={failed?.values?.name} errors={failed?.fieldErrors?.name} />
      <TextField label="E-mail" name="email" type="email" autoComplete="off" required defaultValue={failed?.values?.email} errors={failed?.fieldErrors?.email} />
      <SelectField label="Site" name="siteId" defaultValue={failed?.values?.siteId ?? ""} errors={failed?.fieldErrors?.siteId}>
        <option value="">Choose…</option>
        {sites.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name}
          </option>
        ))}
      </SelectField>
      <SelectField label="Language of the invitation" name="locale" hint="Seedplot writes to the grower, and shows their pages, in this language; they can change it later on My account." defaultValue={failed?.values?.locale ?? "en"} errors={failed?.fieldErrors?.locale}>
        <option value="en">English</option>
        <option value="es">Español (Spanish)</option>
      </SelectField>
      <FormMessage state={state} />
      <SubmitButton pendingText="Sending…">Send invitation</SubmitButton>
    </form>
  );
}
