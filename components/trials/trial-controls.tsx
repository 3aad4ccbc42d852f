"use client";
import { useActionState, useState } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { CheckboxField } from "@/components/ui/checkbox-field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { addEntry, chooseEntryLot, changeSiteNaming, changeSowingDate, changeTrialStatus, enrolSite, randomiseSite, removeEntry } from "@/server/actions/trials";
import { useRefetchTrialAfter } from "./trial-data";
import type { TrialStatus } from "@/lib/domain/vocabulary/enums";
import { STATUS_LABELS } from "@/lib/domain/vocabulary/statuses";

export function AddEntryForm({ trialId, varieties }: { trialId: number; varieties: { id: number; name: string; lots: { id: number; label: string }[] }[] }) {
  const [state, action] = useActionState(addEntry, null);
  useRefetchTrialAfter(trialId, state);
  const f = state && !state.ok ? state : null;
  const [varietyId, setVarietyId] = useState(f?.values?.varietyId ?? "");
  const lots = varieties.find((v) => String(v.id) === varietyId)?.lots ?? [];
  return (
    <form action={action} noValidate className="space-y-3" key={state?.ok ? `saved-${state.message}` : "editing"}>
      <input type="hidden" name="trialId" value={trialId} />
      <SelectField label="Variety" name="varietyId" value={varietyId} onChange={(e) => setVarietyId(e.target.value)} errors={f?.fieldErrors?.varietyId}>
        <option value="">Choose…</option>
        {varieties.map((v) => (
          <option key={v.id} value={v.id}>
            {v.name}
          </option>
        ))}
      </SelectField>
      <SelectField label="Seed lot" name="seedLotId" defaultValue={f?.values?.seedLotId ?? ""} errors={f?.fieldErrors?.seedLotId} key={varietyId}>
        <option value="">{lots.length ? "Choose…" : "No lot recorded yet"}</option>
        {lots.map((l) => (
          <option key={l.id} value={l.id}>
            {l.label}
          </option>
        ))}
      </SelectField>
      <CheckboxField label="Local check variety" name="isCheck" defaultChecked={f?.values?.isCheck === "on"} hint="The standard the others are compared with." />
      <FormMessage state={state} />
      <SubmitButton>Add entry</SubmitButton>
    </form>
  );
}

export function RemoveEntryButton({ trialId, entryId, label }: { trialId: number; entryId: number; label: string }) {
  const [state, action] = useActionState(removeEntry, null);
  useRefetchTrialAfter(trialId, state);
  return (
    <form action={action}>
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="entryId" value={entryId} />
      <SubmitButton variant="ghost" pendingText="Removing…">
        <span className="sr-only">Remove {label}</span>
        <span aria-hidden>Remove</span>
      </SubmitButton>
      {state && !state.ok && <p className="text-sm text-beet-700">{state.formError}</p>}
    </form>
  );
}

export function EnrolSiteForm({ trialId, sites }: { trialId: number; sites: { id: number; name: string; region: string }[] }) {
  const [state, action] = useActionState(enrolSite, null);
  useRefetchTrialAfter(trialId, state);
  const f = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-3" key={state?.ok ? `saved-${state.message}` : "editing"}>
      <input type="hidden" name="trialId" value={trialId} />
      <SelectField label="Site" name="siteId" defaultValue={f?.values?.siteId ?? ""} errors={f?.fieldErrors?.siteId}>
        <option value="">Choose…</option>
        {sites.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name} ({s.region})
          </option>
        ))}
      </SelectField>
      <TextField label="Planned sowing date (optional)" name="sownOn" type="date" defaultValue={f?.values?.sownOn} errors={f?.fieldErrors?.sownOn} />
      <CheckboxField
        label="The grower agrees to the site being named in public results"
        name="namedInResults"
        defaultChecked={f?.values?.namedInResults === "on"}
        hint={'Without it the site is published as "Site N, region" on every public page, download and report.'}
      />
      <FormMessage state={state} />
      <SubmitButton pendingText="Enrolling…">Enrol site</SubmitButton>
    </form>
  );
}

export function RandomiseButton({ trialId, siteId, again, siteName, onDone }: { trialId: number; siteId: number; again: boolean; siteName: string; onDone?: () => void }) {
  const [state, action] = useActionState(randomiseSite, null);
  useRefetchTrialAfter(trialId, state, onDone);
  return (
    <form
      action={action}
      onSubmit={(e) => {
        if (again && !window.confirm(`Draw a new layout for ${siteName}? Printed maps and labels for this site will no longer match, and photos of its plots are deleted.`)) e.preventDefault();
      }}
      className="space-y-1"
    >
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="siteId" value={siteId} />
      <SubmitButton variant={again ? "secondary" : "primary"} pendingText="Randomising…">
        {again ? "Re-randomise" : "Randomise"}
        <span className="sr-only"> {siteName}</span>
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

export function StatusButton({ trialId, to, label }: { trialId: number; to: TrialStatus; label?: string }) {
  const [state, action] = useActionState(changeTrialStatus, null);
  useRefetchTrialAfter(trialId, state);
  return (
    <form action={action} className="space-y-2">
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="status" value={to} />
      <SubmitButton variant="secondary" pendingText="Saving…">
        {label ?? `Move to “${STATUS_LABELS[to]}”`}
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

/**
 * Corrects a site's sowing date. Says what moves with it before the coordinator saves: due dates, and the
 * days to emergence and harvest of values already recorded.
 */
export function SowingDateForm({
  trialId,
  siteId,
  siteName,
  sownOn,
  values,
  onDone,
}: {
  trialId: number;
  siteId: number;
  siteName: string;
  sownOn: string | null;
  values: number;
  onDone: (message: string) => void;
}) {
  const [state, action] = useActionState(changeSowingDate, null);
  useRefetchTrialAfter(trialId, state, () => onDone(state?.ok ? (state.message ?? "Sowing date saved.") : ""));
  const f = state && !state.ok ? state : null;
  const fieldId = `sown-on-${siteId}`;
  return (
    <form action={action} noValidate className="space-y-2 rounded-lg border border-husk-200 bg-husk-50 p-3">
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="siteId" value={siteId} />
      <TextField
        label={`Sowing date at ${siteName}`}
        name="sownOn"
        id={fieldId}
        type="date"
        required
        defaultValue={f?.values?.sownOn ?? sownOn ?? ""}
        errors={f?.fieldErrors?.sownOn}
        hint={
          values > 0
            ? `Due dates move with it. Days to emergence and to harvest are counted from the sowing date, so the ${values} values already recorded here will be counted from the new date. Counts already entered stay under their day (day 5, 7 and so on).`
            : "Due dates for counts and the dates on this site's field sheet move with it."
        }
      />
      {/* A refusal about the date itself already shows under the field. */}
      <FormMessage state={f && !f.fieldErrors?.sownOn ? state : null} />
      <SubmitButton pendingText="Saving…">Save sowing date</SubmitButton>
    </form>
  );
}

/** Records the grower's answer on being named in public results; the next published version follows it. */
export function SiteNamingForm({ trialId, siteId, siteName, named }: { trialId: number; siteId: number; siteName: string; named: boolean }) {
  const [state, action] = useActionState(changeSiteNaming, null);
  useRefetchTrialAfter(trialId, state);
  return (
    <form action={action} className="inline">
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="siteId" value={siteId} />
      <input type="hidden" name="named" value={named ? "0" : "1"} />
      <SubmitButton variant="ghost" pendingText="Saving…">
        {named ? "Grower withdrew consent" : "Grower agreed to be named"}
        <span className="sr-only"> ({siteName})</span>
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

/** Picks this season's seed lot for an entry, from the lots of its variety. */
export function EntryLotForm({ trialId, entryId, variety, lots, current }: { trialId: number; entryId: number; variety: string; lots: { id: number; label: string }[]; current: number | null }) {
  const [state, action] = useActionState(chooseEntryLot, null);
  useRefetchTrialAfter(trialId, state);
  if (lots.length === 0) return <span className="text-loam-700">No lot recorded for {variety} yet (Catalogue).</span>;
  return (
    <form action={action} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="entryId" value={entryId} />
      <label className="sr-only" htmlFor={`lot-${entryId}`}>
        Seed lot for {variety}
      </label>
      <select id={`lot-${entryId}`} name="seedLotId" defaultValue={current ?? ""} className="min-h-11 rounded-lg border border-loam-300 bg-white px-2 text-sm">
        <option value="">Choose a lot…</option>
        {lots.map((l) => (
          <option key={l.id} value={l.id}>
            {l.label}
          </option>
        ))}
      </select>
      <SubmitButton variant="secondary" pendingText="Saving…">
        Save lot<span className="sr-only"> for {variety}</span>
      </SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}
