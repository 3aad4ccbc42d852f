"use client";
import { useActionState, useEffect, useRef } from "react";
import { TextField, SelectField } from "@/components/ui/field";
import { CheckboxField } from "@/components/ui/checkbox-field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { createCrop, createSeedLot, createTrait, createVariety, editCrop, editSeedLot, editTrait, editVariety } from "@/server/actions/catalogue";
import { CROP_GROUPS, TRAIT_COMPUTATIONS, TRAIT_TYPES } from "@/lib/domain/vocabulary/enums";
import { COMPUTATION_LABELS, CROP_GROUP_LABELS, TRAIT_TYPE_LABELS } from "@/lib/domain/vocabulary/labels";
import type { ActionResult } from "@/lib/validation/action-result";
import type { CropRow, SeedLotRow, TraitRow, VarietyRow } from "@/db/queries/catalogue";
import type { ProgramOption } from "@/db/queries/programs";
import { ProgramField } from "@/components/portal/program-field";

const failedOf = (state: ActionResult | null) => (state && !state.ok ? state : null);
const text = (v: string | number | null | undefined) => (v === null || v === undefined ? undefined : String(v));

/**
 * Each form adds an item, or edits `item` when given. Edit forms prefix their ids so they can sit in a
 * dialog beside the add form, and report success through `onSaved` instead of clearing themselves.
 */
function useCatalogueForm(
  create: (s: ActionResult | null, f: FormData) => Promise<ActionResult>,
  edit: (s: ActionResult | null, f: FormData) => Promise<ActionResult>,
  editing: boolean,
  onSaved?: (message: string) => void,
) {
  const [state, action] = useActionState(editing ? edit : create, null);
  // Reported once per result, however often the parent re-renders with a new callback.
  const reported = useRef<ActionResult | null>(null);
  useEffect(() => {
    if (editing && state?.ok && reported.current !== state) {
      reported.current = state;
      onSaved?.(state.message ?? "Saved.");
    }
  }, [editing, state, onSaved]);
  const f = failedOf(state);
  return { state, action, f, formKey: !editing && state?.ok ? `saved-${state.message ?? ""}` : "editing", id: (name: string) => (editing ? `edit-${name}` : name) };
}

export function CropForm({ item, onSaved }: { item?: CropRow; onSaved?: (message: string) => void }) {
  const { state, action, f, formKey, id } = useCatalogueForm(createCrop, editCrop, !!item, onSaved);
  return (
    <form action={action} noValidate className="space-y-3" key={formKey}>
      {item && <input type="hidden" name="cropId" value={item.id} />}
      <TextField label="Crop name" name="name" id={id("crop-name")} required defaultValue={f?.values?.name ?? item?.name} errors={f?.fieldErrors?.name} />
      <SelectField label="Crop group" name="cropGroup" id={id("cropGroup")} defaultValue={f?.values?.cropGroup ?? item?.cropGroup ?? ""} errors={f?.fieldErrors?.cropGroup}>
        <option value="">Choose…</option>
        {CROP_GROUPS.map((g) => (
          <option key={g} value={g}>
            {CROP_GROUP_LABELS[g]}
          </option>
        ))}
      </SelectField>
      <TextField label="Scientific name (optional)" name="scientificName" id={id("scientificName")} defaultValue={f?.values?.scientificName ?? text(item?.scientificName)} errors={f?.fieldErrors?.scientificName} />
      <FormMessage state={state} />
      <SubmitButton>{item ? "Save crop" : "Add crop"}</SubmitButton>
    </form>
  );
}

/** `programs` is for adding: an edited variety stays in its program. */
export function VarietyForm({ crops, programs = [], item, onSaved }: { crops: { id: number; name: string }[]; programs?: ProgramOption[]; item?: VarietyRow; onSaved?: (message: string) => void }) {
  const { state, action, f, formKey, id } = useCatalogueForm(createVariety, editVariety, !!item, onSaved);
  return (
    <form action={action} noValidate className="space-y-3" key={formKey}>
      {item && <input type="hidden" name="varietyId" value={item.id} />}
      {!item && <ProgramField programs={programs} id={id("variety-program")} defaultValue={f?.values?.programId} errors={f?.fieldErrors?.programId} />}
      <SelectField label="Crop" name="cropId" id={id("variety-crop")} defaultValue={f?.values?.cropId ?? text(item?.cropId) ?? ""} errors={f?.fieldErrors?.cropId}>
        <option value="">Choose…</option>
        {crops.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Variety name" name="name" id={id("variety-name")} defaultValue={f?.values?.name ?? item?.name} errors={f?.fieldErrors?.name} />
      <TextField label="Notes (optional)" name="description" id={id("description")} defaultValue={f?.values?.description ?? text(item?.description)} errors={f?.fieldErrors?.description} />
      <FormMessage state={state} />
      <SubmitButton>{item ? "Save variety" : "Add variety"}</SubmitButton>
    </form>
  );
}

export function SeedLotForm({ varieties, item, onSaved }: { varieties: { id: number; name: string; crop: string }[]; item?: SeedLotRow; onSaved?: (message: string) => void }) {
  const { state, action, f, formKey, id } = useCatalogueForm(createSeedLot, editSeedLot, !!item, onSaved);
  const treated = f ? f.values?.treated === "on" : !!item?.treated;
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={formKey}>
      {item && <input type="hidden" name="seedLotId" value={item.id} />}
      <SelectField label="Variety" name="varietyId" id={id("varietyId")} defaultValue={f?.values?.varietyId ?? text(item?.varietyId) ?? ""} errors={f?.fieldErrors?.varietyId} className="sm:col-span-2">
        <option value="">Choose…</option>
        {varieties.map((v) => (
          <option key={v.id} value={v.id}>
            {v.crop}: {v.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Source (seed company or saver)" name="source" id={id("source")} defaultValue={f?.values?.source ?? item?.source} errors={f?.fieldErrors?.source} />
      <TextField label="Lot code" name="lotCode" id={id("lotCode")} defaultValue={f?.values?.lotCode ?? item?.lotCode} errors={f?.fieldErrors?.lotCode} />
      <TextField
        label="Germination on the label (%)"
        name="labelGerminationPct"
        id={id("labelGerminationPct")}
        inputMode="decimal"
        hint="Leave empty if the label does not state it."
        defaultValue={f?.values?.labelGerminationPct ?? text(item?.labelGerminationPct)}
        errors={f?.fieldErrors?.labelGerminationPct}
      />
      <TextField
        label="Germination test date"
        name="germinationTestDate"
        id={id("germinationTestDate")}
        type="date"
        defaultValue={f?.values?.germinationTestDate ?? text(item?.germinationTestDate)}
        errors={f?.fieldErrors?.germinationTestDate}
      />
      <TextField
        label="Days to maturity on the packet"
        name="packetDaysToMaturity"
        id={id("packetDaysToMaturity")}
        inputMode="numeric"
        defaultValue={f?.values?.packetDaysToMaturity ?? text(item?.packetDaysToMaturity)}
        errors={f?.fieldErrors?.packetDaysToMaturity}
      />
      <div className="space-y-2">
        <CheckboxField label="Treated seed" name="treated" id={id("treated")} defaultChecked={treated} hint="Sheets for sites sowing this lot will carry handling cautions." />
        <TextField label="Treatment (from the seed tag)" name="treatment" id={id("treatment")} defaultValue={f?.values?.treatment ?? text(item?.treatment)} errors={f?.fieldErrors?.treatment} />
      </div>
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>{item ? "Save seed lot" : "Record seed lot"}</SubmitButton>
      </div>
    </form>
  );
}

/** `programs` is for adding: an edited trait stays in its program. */
export function TraitForm({ programs = [], item, onSaved }: { programs?: ProgramOption[]; item?: TraitRow; onSaved?: (message: string) => void }) {
  const { state, action, f, formKey, id } = useCatalogueForm(createTrait, editTrait, !!item, onSaved);
  return (
    <form action={action} noValidate className="grid gap-3 sm:grid-cols-2" key={formKey}>
      {item && <input type="hidden" name="traitId" value={item.id} />}
      {!item && <ProgramField programs={programs} id={id("trait-program")} defaultValue={f?.values?.programId} errors={f?.fieldErrors?.programId} className="sm:col-span-2" />}
      <TextField label="Trait name" name="name" id={id("name")} defaultValue={f?.values?.name ?? item?.name} errors={f?.fieldErrors?.name} />
      <TextField label="Short code" name="code" id={id("code")} hint="Lowercase, e.g. stem_length" defaultValue={f?.values?.code ?? item?.code} errors={f?.fieldErrors?.code} />
      <SelectField label="Kind of value" name="valueType" id={id("valueType")} defaultValue={f?.values?.valueType ?? item?.valueType ?? ""} errors={f?.fieldErrors?.valueType}>
        <option value="">Choose…</option>
        {TRAIT_TYPES.map((t) => (
          <option key={t} value={t}>
            {TRAIT_TYPE_LABELS[t]}
          </option>
        ))}
      </SelectField>
      <TextField label="Unit (optional)" name="unit" id={id("unit")} hint="e.g. cm, g per plot" defaultValue={f?.values?.unit ?? text(item?.unit)} errors={f?.fieldErrors?.unit} />
      <TextField label="Lowest valid value" name="minValue" id={id("minValue")} inputMode="decimal" defaultValue={f?.values?.minValue ?? text(item?.minValue)} errors={f?.fieldErrors?.minValue} />
      <TextField label="Highest valid value" name="maxValue" id={id("maxValue")} inputMode="decimal" defaultValue={f?.values?.maxValue ?? text(item?.maxValue)} errors={f?.fieldErrors?.maxValue} />
      <TextField
        label="Due on days after sowing"
        name="dueDaysAfterSowing"
        id={id("dueDaysAfterSowing")}
        hint="For repeated counts, e.g. 5, 7, 10, 14"
        defaultValue={f?.values?.dueDaysAfterSowing ?? item?.dueDaysAfterSowing?.join(", ")}
        errors={f?.fieldErrors?.dueDaysAfterSowing}
      />
      <TextField label="Or when it is due" name="dueNote" id={id("dueNote")} hint="e.g. At first harvest" defaultValue={f?.values?.dueNote ?? text(item?.dueNote)} errors={f?.fieldErrors?.dueNote} />
      <SelectField label="How it is analysed" name="computation" id={id("computation")} defaultValue={f?.values?.computation ?? item?.computation ?? "none"} errors={f?.fieldErrors?.computation}>
        {TRAIT_COMPUTATIONS.map((c) => (
          <option key={c} value={c}>
            {COMPUTATION_LABELS[c]}
          </option>
        ))}
      </SelectField>
      <TextField label="How to record it (optional)" name="description" id={id("description")} defaultValue={f?.values?.description ?? text(item?.description)} errors={f?.fieldErrors?.description} />
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>{item ? "Save trait" : "Add trait"}</SubmitButton>
      </div>
    </form>
  );
}
