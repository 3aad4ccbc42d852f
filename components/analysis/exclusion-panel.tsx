"use client";
import { startTransition, useActionState, useEffect, useRef, useState } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { excludeFromAnalysis, includeInAnalysis } from "@/server/actions/exclusions";
import type { AnalysisPayload } from "@/lib/domain/analysis/types";
import { EXCLUSION_CATEGORIES, type ExclusionCategory } from "@/lib/domain/vocabulary/enums";
import { EXCLUSION_CATEGORY_LABELS } from "@/lib/domain/vocabulary/labels";
import { SelectField, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { formatDate } from "@/lib/domain/vocabulary/labels";

export interface ExclusionTargets {
  sites: { id: number; name: string }[];
  examplePlotCode: string | null;
  /** every exclusion of the trial, whatever trait the page shows, with the staff's note */
  exclusions: { id: number; siteName: string | null; plotCode: string | null; traitName: string | null; category: ExclusionCategory; note: string | null; createdAt: string; createdBy: string | null }[];
}

/**
 * Lists the trial's exclusions and lets a coordinator add or remove one; the analysis refetches after each
 * change. The public reason is a category (published with the results); the note stays with the staff.
 */
export function ExclusionPanel({ trialId, result, targets }: { trialId: number; result: Pick<AnalysisPayload, "traits">; targets: ExclusionTargets }) {
  const client = useQueryClient();
  const [state, action, excluding] = useActionState(excludeFromAnalysis, null);
  const [removeState, removeAction] = useActionState(includeInAnalysis, null);
  useEffect(() => {
    if (state?.ok || removeState?.ok) void client.invalidateQueries({ queryKey: ["analysis", trialId] });
  }, [state, removeState, client, trialId]);
  const values = state && !state.ok ? state.values : undefined;
  const errors = state && !state.ok ? state.fieldErrors : undefined;
  const [target, setTarget] = useState("");
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (!state?.ok) return;
    formRef.current?.reset();
    setTarget("");
  }, [state]);
  // Submitting through a transition rather than the form's action keeps what was typed after a
  // refusal (a form action resets every field), so the coordinator only fixes the marked field.
  const submit = (event: React.FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const data = new FormData(event.currentTarget);
    startTransition(() => action(data));
  };
  return (
    <div className="space-y-4">
      {targets.exclusions.length === 0 ? (
        <p className="text-sm text-loam-700">Nothing is excluded. Every accepted plot counts.</p>
      ) : (
        <ul className="space-y-2" aria-label="Exclusions">
          {targets.exclusions.map((x) => (
            <li key={x.id} className="flex flex-wrap items-center justify-between gap-2 rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-sm">
              <span>
                <strong>{x.plotCode ? `Plot ${x.plotCode} (${x.siteName})` : `Whole site ${x.siteName}`}</strong>
                {" — "}
                {x.traitName ? `${x.traitName} only` : "all traits"}. Public reason: {EXCLUSION_CATEGORY_LABELS[x.category]}.
                {x.note && <span className="block">Private note: {x.note}</span>}
                <span className="block text-loam-700">
                  {x.createdBy ?? "someone"}, {formatDate(x.createdAt)}
                </span>
              </span>
              <form action={removeAction}>
                <input type="hidden" name="trialId" value={trialId} />
                <input type="hidden" name="exclusionId" value={x.id} />
                <SubmitButton variant="secondary" pendingText="Including…">
                  Include again
                </SubmitButton>
              </form>
            </li>
          ))}
        </ul>
      )}
      <FormMessage state={removeState} />
      <form ref={formRef} onSubmit={submit} className="grid gap-3 md:grid-cols-2 md:items-start xl:grid-cols-3">
        <input type="hidden" name="trialId" value={trialId} />
        <SelectField label="Leave out" name="target" value={target} onChange={(e) => setTarget(e.target.value)} errors={errors?.target}>
          <option value="">Choose a site or a plot…</option>
          <optgroup label="Whole site">
            {targets.sites.map((s) => (
              <option key={s.id} value={`site:${s.id}`}>
                {s.name}
              </option>
            ))}
          </optgroup>
          <option value="plot">One plot, by its code…</option>
        </SelectField>
        {target === "plot" ? (
          <TextField
            label="Plot code"
            name="plotCode"
            defaultValue={values?.plotCode}
            errors={errors?.plotCode}
            placeholder={targets.examplePlotCode ? `e.g. ${targets.examplePlotCode}` : undefined}
            autoComplete="off"
            spellCheck={false}
            autoFocus
          />
        ) : (
          <div aria-hidden="true" className="hidden md:block" />
        )}
        <SelectField label="For" name="traitId" defaultValue={values?.traitId ?? "all"} errors={errors?.traitId}>
          <option value="all">All traits</option>
          {result.traits.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name} only
            </option>
          ))}
        </SelectField>
        <SelectField label="Public reason" name="category" defaultValue={values?.category ?? ""} errors={errors?.category} hint="Growers of the site see it, and it is printed with the published results and report.">
          <option value="">Choose a reason…</option>
          {EXCLUSION_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {EXCLUSION_CATEGORY_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <TextField label="Private note (staff only)" name="note" defaultValue={values?.note} errors={errors?.note} hint="Stays in the portal; never published or shown to growers." placeholder="e.g. deer browsed block 2 on 3 June" />
        <Button type="submit" disabled={excluding} aria-disabled={excluding} className="justify-self-start md:mt-6">
          {excluding ? "Excluding…" : "Exclude"}
        </Button>
      </form>
      <FormMessage state={state} />
    </div>
  );
}
