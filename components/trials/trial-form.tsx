"use client";
import { useActionState, useState } from "react";
import { TextField, SelectField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { createTrial, editTrial } from "@/server/actions/trials";
import { PLOT_UNITS, TRIAL_DESIGNS } from "@/lib/domain/vocabulary/enums";
import { DESIGN_LABELS, PLOT_UNIT_LABELS } from "@/lib/domain/vocabulary/labels";

interface Options {
  seasons: { id: number; name: string; program: string }[];
  crops: { id: number; name: string }[];
  traits: { id: number; name: string; unit: string | null; dueNote: string | null; dueDaysAfterSowing: number[] | null }[];
}

/** Current values of an existing trial, for the edit form. */
export interface TrialDefaults {
  id: number;
  title: string;
  purpose: string | null;
  design: string;
  blocks: number;
  plotUnit: string;
  plotSize: number;
  seedsPerCell: number;
  protocol: string | null;
  traitIds: number[];
}

export function TrialForm({ options, trial }: { options: Options; trial?: TrialDefaults }) {
  const [state, action] = useActionState(trial ? editTrial : createTrial, null);
  const f = state && !state.ok ? state : null;
  // After a failed submit the typed values win; otherwise an edit starts from the stored trial.
  const v = (key: string, stored: string | number | null | undefined, fallback = "") => f?.values?.[key] ?? (stored === null || stored === undefined ? fallback : String(stored));
  const [plotUnit, setPlotUnit] = useState(v("plotUnit", trial?.plotUnit, "insert"));
  const traitChecked = (id: number) => (f ? f.values?.[`trait_${id}`] === "on" : !!trial?.traitIds.includes(id));
  return (
    <form action={action} noValidate className="grid gap-4 sm:grid-cols-2">
      {trial ? (
        <input type="hidden" name="trialId" value={trial.id} />
      ) : (
        <>
      <SelectField label="Season" name="seasonId" defaultValue={f?.values?.seasonId ?? ""} errors={f?.fieldErrors?.seasonId}>
        <option value="">Choose…</option>
        {options.seasons.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name} · {s.program}
          </option>
        ))}
      </SelectField>
      <SelectField label="Crop" name="cropId" defaultValue={f?.values?.cropId ?? ""} errors={f?.fieldErrors?.cropId}>
        <option value="">Choose…</option>
        {options.crops.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Trial code" name="code" hint="Short and unique, e.g. W27-KALE" defaultValue={f?.values?.code} errors={f?.fieldErrors?.code} />
        </>
      )}
      <TextField label="Title" name="title" defaultValue={v("title", trial?.title)} errors={f?.fieldErrors?.title} />
      <TextField label="Purpose (the question the trial answers)" name="purpose" className="sm:col-span-2" defaultValue={v("purpose", trial?.purpose)} errors={f?.fieldErrors?.purpose} />
      <SelectField label="Design" name="design" defaultValue={v("design", trial?.design, "rcbd")} errors={f?.fieldErrors?.design}>
        {TRIAL_DESIGNS.map((d) => (
          <option key={d} value={d}>
            {DESIGN_LABELS[d]}
          </option>
        ))}
      </SelectField>
      <TextField
        label="Blocks (replicates) per site"
        name="blocks"
        inputMode="numeric"
        hint="Four or more is the usual minimum."
        defaultValue={v("blocks", trial?.blocks, "4")}
        errors={f?.fieldErrors?.blocks}
      />
      <SelectField label="Plot unit" name="plotUnit" value={plotUnit} onChange={(e) => setPlotUnit(e.target.value)} errors={f?.fieldErrors?.plotUnit}>
        {PLOT_UNITS.map((u) => (
          <option key={u} value={u}>
            {PLOT_UNIT_LABELS[u]}
          </option>
        ))}
      </SelectField>
      <TextField
        key={plotUnit}
        label={plotUnit === "bed_row" ? "Plants per bed-row plot" : "Cells per plot"}
        name="plotSize"
        inputMode="numeric"
        hint={plotUnit === "insert" ? "A six-cell insert has 6 cells." : plotUnit === "cells" ? "At most 72 (one 1020 flat)." : undefined}
        defaultValue={f?.values?.plotSize ?? (trial && trial.plotUnit === plotUnit ? String(trial.plotSize) : plotUnit === "insert" ? "6" : plotUnit === "cells" ? "12" : "10")}
        readOnly={plotUnit === "insert"}
        errors={f?.fieldErrors?.plotSize}
      />
      <TextField label="Seeds per cell" name="seedsPerCell" inputMode="numeric" defaultValue={v("seedsPerCell", trial?.seedsPerCell, "1")} errors={f?.fieldErrors?.seedsPerCell} />
      <TextField label="Protocol notes for growers (optional)" name="protocol" className="sm:col-span-2" defaultValue={v("protocol", trial?.protocol)} errors={f?.fieldErrors?.protocol} />
      <fieldset className="sm:col-span-2">
        <legend className="text-sm font-semibold">Traits to record</legend>
        {f?.fieldErrors?.traitIds && <p className="text-sm font-medium text-beet-700">{f.fieldErrors.traitIds.join(" ")}</p>}
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          {options.traits.map((t) => (
            <label key={t.id} className="flex items-start gap-2 text-sm">
              <input type="checkbox" name={`trait_${t.id}`} defaultChecked={traitChecked(t.id)} className="mt-1 size-5 accent-sprout-600" />
              <span>
                <span className="font-semibold">{t.name}</span>
                <span className="block text-loam-700">{t.dueDaysAfterSowing?.length ? `Days ${t.dueDaysAfterSowing.join(", ")} after sowing` : (t.dueNote ?? "")}</span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      <div className="space-y-3 sm:col-span-2">
        <FormMessage state={state} />
        <SubmitButton>{trial ? "Save changes" : "Create draft trial"}</SubmitButton>
      </div>
    </form>
  );
}
