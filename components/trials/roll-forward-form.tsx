"use client";
import { useActionState } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { planNextSeason } from "@/server/actions/trials";

/** Starts next season's draft from this trial: same set-up, traits, entries and sites, in a chosen season. */
export function RollForwardForm({ trialId, title, seasons }: { trialId: number; title: string; seasons: { id: number; name: string; year: number }[] }) {
  const [state, action] = useActionState(planNextSeason, null);
  const f = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-3">
      <input type="hidden" name="trialId" value={trialId} />
      <p className="text-sm text-loam-700">
        Makes a new draft with this trial&apos;s crop, design, protocol, traits (order and directions), entries with their varieties and the check,
        and its sites. Entries get new blind codes and no seed lot: pick this season&apos;s lots, then add or drop entries. Sites are enrolled again
        and their growers told, as for any enrolment, without consent to be named in public results: record each grower&apos;s answer
        again. Nothing is laid out or sown yet.
      </p>
      <SelectField label="Season" name="seasonId" defaultValue={f?.values?.seasonId ?? ""} errors={f?.fieldErrors?.seasonId}>
        <option value="">Choose…</option>
        {seasons.map((s) => (
          <option key={s.id} value={s.id}>
            {/\d{4}/.test(s.name) ? s.name : `${s.name} ${s.year}`}
          </option>
        ))}
      </SelectField>
      <TextField label="New trial code" name="code" defaultValue={f?.values?.code ?? ""} hint="Letters, digits or dashes, e.g. TV27-LET." errors={f?.fieldErrors?.code} />
      <TextField label="Title" name="title" defaultValue={f?.values?.title ?? title} errors={f?.fieldErrors?.title} />
      <FormMessage state={state} />
      <SubmitButton>Plan next season from this trial</SubmitButton>
    </form>
  );
}
