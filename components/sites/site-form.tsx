"use client";
import { useActionState } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { createSite } from "@/server/actions/sites";
import { GROWING_SETUPS, SITE_KINDS } from "@/lib/domain/vocabulary/enums";
import { SETUP_LABELS, SITE_KIND_LABELS } from "@/lib/domain/vocabulary/labels";
import { ProgramField } from "@/components/portal/program-field";
import type { ProgramOption } from "@/db/queries/programs";

export function SiteForm({ programs }: { programs: ProgramOption[] }) {
  const [state, action] = useActionState(createSite, null);
  const f = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={state?.ok ? `saved-${state.message}` : "editing"}>
      <ProgramField programs={programs} defaultValue={f?.values?.programId} errors={f?.fieldErrors?.programId} className="sm:col-span-2" />
      <TextField label="Site name" name="name" defaultValue={f?.values?.name} errors={f?.fieldErrors?.name} />
      <SelectField label="Kind" name="kind" defaultValue={f?.values?.kind ?? "farm"} errors={f?.fieldErrors?.kind}>
        {SITE_KINDS.map((k) => (
          <option key={k} value={k}>
            {SITE_KIND_LABELS[k]}
          </option>
        ))}
      </SelectField>
      <TextField label="County or region" name="region" defaultValue={f?.values?.region} errors={f?.fieldErrors?.region} />
      <SelectField label="Growing setup" name="growingSetup" defaultValue={f?.values?.growingSetup ?? ""} errors={f?.fieldErrors?.growingSetup}>
        <option value="">Choose…</option>
        {GROWING_SETUPS.map((g) => (
          <option key={g} value={g}>
            {SETUP_LABELS[g]}
          </option>
        ))}
      </SelectField>
      <TextField label="Latitude (optional)" name="latitude" inputMode="decimal" defaultValue={f?.values?.latitude} errors={f?.fieldErrors?.latitude} />
      <TextField label="Longitude (optional)" name="longitude" inputMode="decimal" defaultValue={f?.values?.longitude} errors={f?.fieldErrors?.longitude} />
      <TextField label="Soil or growing medium" name="soil" defaultValue={f?.values?.soil} errors={f?.fieldErrors?.soil} />
      <TextField label="Irrigation" name="irrigation" defaultValue={f?.values?.irrigation} errors={f?.fieldErrors?.irrigation} />
      <TextField label="Grower's name" name="cooperatorName" defaultValue={f?.values?.cooperatorName} errors={f?.fieldErrors?.cooperatorName} />
      <TextField
        label="Grower's e-mail"
        name="cooperatorEmail"
        type="email"
        hint="They are invited when the site joins a trial."
        defaultValue={f?.values?.cooperatorEmail}
        errors={f?.fieldErrors?.cooperatorEmail}
      />
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>Add site</SubmitButton>
      </div>
    </form>
  );
}
