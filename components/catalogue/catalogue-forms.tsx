"use client";
import { useActionState } from "react";
import { TextField, SelectField } from "@/components/ui/field";
import { CheckboxField } from "@/components/ui/checkbox-field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { createCrop, createSeedLot, createTrait, createVariety } from "@/lib/actions/catalogue";
import { CROP_GROUPS, TRAIT_COMPUTATIONS, TRAIT_TYPES } from "@/db/schema/enums";
import { COMPUTATION_LABELS, CROP_GROUP_LABELS, TRAIT_TYPE_LABELS } from "@/lib/labels";
import type { ActionResult } from "@/lib/actions/result";

const failedOf = (state: ActionResult | null) => (state && !state.ok ? state : null);

export function CropForm() {
  const [state, action] = useActionState(createCrop, null);
  const f = failedOf(state);
  return (
    <form action={action} noValidate className="space-y-3" key={state?.ok ? `saved-${state.message ?? ""}` : "editing"}>
      <TextField label="Crop name" name="name" id="crop-name" required defaultValue={f?.values?.name} errors={f?.fieldErrors?.name} />
      <SelectField label="Crop group" name="cropGroup" defaultValue={f?.values?.cropGroup ?? ""} errors={f?.fieldErrors?.cropGroup}>
        <option value="">Choose…</option>
        {CROP_GROUPS.map((g) => (
          <option key={g} value={g}>
            {CROP_GROUP_LABELS[g]}
          </option>
        ))}
      </SelectField>
      <TextField label="Scientific name (optional)" name="scientificName" defaultValue={f?.values?.scientificName} errors={f?.fieldErrors?.scientificName} />
      <FormMessage state={state} />
      <SubmitButton>Add crop</SubmitButton>
    </form>
  );
}

export function VarietyForm({ crops }: { crops: { id: number; name: string }[] }) {
  const [state, action] = useActionState(createVariety, null);
  const f = failedOf(state);
  return (
    <form action={action} noValidate className="space-y-3" key={state?.ok ? `saved-${state.message ?? ""}` : "editing"}>
      <SelectField label="Crop" name="cropId" id="variety-crop" defaultValue={f?.values?.cropId ?? ""} errors={f?.fieldErrors?.cropId}>
        <option value="">Choose…</option>
        {crops.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Variety name" name="name" id="variety-name" defaultValue={f?.values?.name} errors={f?.fieldErrors?.name} />
      <TextField label="Notes (optional)" name="description" defaultValue={f?.values?.description} errors={f?.fieldErrors?.description} />
      <FormMessage state={state} />
      <SubmitButton>Add variety</SubmitButton>
    </form>
  );
}

export function SeedLotForm({ varieties }: { varieties: { id: number; name: string; crop: string }[] }) {
  const [state, action] = useActionState(createSeedLot, null);
  const f = failedOf(state);
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={state?.ok ? `saved-${state.message ?? ""}` : "editing"}>
      <SelectField label="Variety" name="varietyId" defaultValue={f?.values?.varietyId ?? ""} errors={f?.fieldErrors?.varietyId} className="sm:col-span-2">
        <option value="">Choose…</option>
        {varieties.map((v) => (
          <option key={v.id} value={v.id}>
            {v.crop}: {v.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Source (seed company or saver)" name="source" defaultValue={f?.values?.source} errors={f?.fieldErrors?.source} />
      <TextField label="Lot code" name="lotCode" defaultValue={f?.values?.lotCode} errors={f?.fieldErrors?.lotCode} />
      <TextField
        label="Germination on the label (%)"
        name="labelGerminationPct"
        inputMode="decimal"
        hint="Leave empty if the label does not state it."
        defaultValue={f?.values?.labelGerminationPct}
        errors={f?.fieldErrors?.labelGerminationPct}
      />
      <TextField label="Germination test date" name="germinationTestDate" type="date" defaultValue={f?.values?.germinationTestDate} errors={f?.fieldErrors?.germinationTestDate} />
      <TextField label="Days to maturity on the packet" name="packetDaysToMaturity" inputMode="numeric" defaultValue={f?.values?.packetDaysToMaturity} errors={f?.fieldErrors?.packetDaysToMaturity} />
      <div className="space-y-2">
        <CheckboxField label="Treated seed" name="treated" defaultChecked={f?.values?.treated === "on"} hint="Sheets for sites sowing this lot will carry handling cautions." />
        <TextField label="Treatment (from the seed tag)" name="treatment" defaultValue={f?.values?.treatment} errors={f?.fieldErrors?.treatment} />
      </div>
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>Record seed lot</SubmitButton>
      </div>
    </form>
  );
}

export function TraitForm() {
  const [state, action] = useActionState(createTrait, null);
  const f = failedOf(state);
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={state?.ok ? `saved-${state.message ?? ""}` : "editing"}>
      <TextField label="Trait name" name="name" defaultValue={f?.values?.name} errors={f?.fieldErrors?.name} />
      <TextField label="Short code" name="code" hint="Lowercase, e.g. stem_length" defaultValue={f?.values?.code} errors={f?.fieldErrors?.code} />
      <SelectField label="Kind of value" name="valueType" defaultValue={f?.values?.valueType ?? ""} errors={f?.fieldErrors?.valueType}>
        <option value="">Choose…</option>
        {TRAIT_TYPES.map((t) => (
          <option key={t} value={t}>
            {TRAIT_TYPE_LABELS[t]}
          </option>
        ))}
      </SelectField>
      <TextField label="Unit (optional)" name="unit" hint="e.g. cm, g per plot" defaultValue={f?.values?.unit} errors={f?.fieldErrors?.unit} />
      <TextField label="Lowest valid value" name="minValue" inputMode="decimal" defaultValue={f?.values?.minValue} errors={f?.fieldErrors?.minValue} />
      <TextField label="Highest valid value" name="maxValue" inputMode="decimal" defaultValue={f?.values?.maxValue} errors={f?.fieldErrors?.maxValue} />
      <TextField
        label="Due on days after sowing"
        name="dueDaysAfterSowing"
        hint="For repeated counts, e.g. 5, 7, 10, 14"
        defaultValue={f?.values?.dueDaysAfterSowing}
        errors={f?.fieldErrors?.dueDaysAfterSowing}
      />
      <TextField label="Or when it is due" name="dueNote" hint="e.g. At first harvest" defaultValue={f?.values?.dueNote} errors={f?.fieldErrors?.dueNote} />
      <SelectField label="How it is analysed" name="computation" defaultValue={f?.values?.computation ?? "none"} errors={f?.fieldErrors?.computation}>
        {TRAIT_COMPUTATIONS.map((c) => (
          <option key={c} value={c}>
            {COMPUTATION_LABELS[c]}
          </option>
        ))}
      </SelectField>
      <TextField label="How to record it (optional)" name="description" defaultValue={f?.values?.description} errors={f?.fieldErrors?.description} />
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>Add trait</SubmitButton>
      </div>
    </form>
  );
}
