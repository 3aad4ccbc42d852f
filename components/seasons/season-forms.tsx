"use client";
import { useActionState } from "react";
import { TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { ProgramField } from "@/components/portal/program-field";
import { addSeason, changeSeason } from "@/server/actions/seasons";
import type { ActionResult } from "@/lib/validation/action-result";
import type { ProgramOption } from "@/db/queries/programs";
import type { SeasonListRow } from "@/db/queries/seasons";

function SeasonFields({ f, season, idPrefix }: { f: Extract<ActionResult, { ok: false }> | null; season?: SeasonListRow; idPrefix: string }) {
  const v = (key: string, stored: string | number | null | undefined) => f?.values?.[key] ?? (stored === null || stored === undefined ? "" : String(stored));
  return (
    <>
      <TextField id={`${idPrefix}-name`} label="Season name" name="name" hint="As growers and readers will see it, e.g. Spring 2027." defaultValue={v("name", season?.name)} errors={f?.fieldErrors?.name} />
      <TextField id={`${idPrefix}-year`} label="Year" name="year" inputMode="numeric" defaultValue={v("year", season?.year ?? new Date().getFullYear() + 1)} errors={f?.fieldErrors?.year} />
      <TextField id={`${idPrefix}-startsOn`} label="First day (optional)" name="startsOn" type="date" defaultValue={v("startsOn", season?.startsOn)} errors={f?.fieldErrors?.startsOn} />
      <TextField id={`${idPrefix}-endsOn`} label="Last day (optional)" name="endsOn" type="date" defaultValue={v("endsOn", season?.endsOn)} errors={f?.fieldErrors?.endsOn} />
    </>
  );
}

/** Adds a season to one of the viewer's programs. */
export function NewSeasonForm({ programs }: { programs: ProgramOption[] }) {
  const [state, action] = useActionState(addSeason, null);
  const f = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={state?.ok ? `saved-${state.message}` : "editing"}>
      <ProgramField programs={programs} id="new-season-program" defaultValue={f?.values?.programId} errors={f?.fieldErrors?.programId} className="sm:col-span-2" />
      <SeasonFields f={f} idPrefix="new-season" />
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>Add season</SubmitButton>
      </div>
    </form>
  );
}

/** Edits one season's name, year and dates (inside its dialog). */
export function EditSeasonForm({ season, onSaved }: { season: SeasonListRow; onSaved: (message: string) => void }) {
  const [state, action] = useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await changeSeason(previous, formData);
    if (result.ok) onSaved(result.message ?? "Season saved.");
    return result;
  }, null);
  const f = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2">
      <input type="hidden" name="seasonId" value={season.id} />
      <SeasonFields f={f} season={season} idPrefix={`season-${season.id}`} />
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>Save season</SubmitButton>
      </div>
    </form>
  );
}
