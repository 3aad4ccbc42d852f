"use client";
import { useActionState } from "react";
import { useTranslations } from "next-intl";
import { SelectField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { acceptSubmission, addReviewComment, returnSubmission, submitForReview } from "@/server/actions/review";

interface Site {
  trialId: number;
  siteId: number;
}

function Hidden({ site }: { site: Site }) {
  return (
    <>
      <input type="hidden" name="trialId" value={site.trialId} />
      <input type="hidden" name="siteId" value={site.siteId} />
    </>
  );
}

function TextArea({ label, name, errors, defaultValue, hint }: { label: string; name: string; errors?: string[]; defaultValue?: string; hint?: string }) {
  return (
    <div className="space-y-1">
      <label htmlFor={name} className="block text-sm font-semibold text-loam-900">
        {label}
      </label>
      {hint && <p className="text-sm text-loam-700">{hint}</p>}
      <textarea id={name} name={name} rows={3} defaultValue={defaultValue} aria-invalid={errors?.length ? true : undefined} aria-describedby={errors?.length ? `${name}-error` : undefined} className="block w-full rounded-lg border border-loam-300 bg-white px-3 py-2 text-base" />
      {errors?.length ? (
        <p id={`${name}-error`} className="text-sm font-medium text-beet-700">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

/** A comment on a plot or one of its values; it reaches the grower when the data is returned. */
export function CommentForm({ site, plots, columns, initialPlot, initialKey }: { site: Site; plots: { id: number; plotCode: string }[]; columns: { key: string; name: string }[]; initialPlot?: number; initialKey?: string }) {
  const [state, action] = useActionState(addReviewComment, null);
  const failed = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-3" key={state?.ok ? `sent-${Math.random()}` : "editing"}>
      <Hidden site={site} />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label="Plot" name="plotId" defaultValue={failed?.values?.plotId ?? (initialPlot ? String(initialPlot) : "")} errors={failed?.fieldErrors?.plotId}>
          <option value="">The whole site</option>
          {plots.map((p) => (
            <option key={p.id} value={p.id}>
              {p.plotCode}
            </option>
          ))}
        </SelectField>
        <SelectField label="Value" name="key" defaultValue={failed?.values?.key ?? initialKey ?? ""} errors={failed?.fieldErrors?.key}>
          <option value="">The whole plot</option>
          {columns.map((c) => (
            <option key={c.key} value={c.key}>
              {c.name}
            </option>
          ))}
        </SelectField>
      </div>
      <TextArea label="Comment for the grower" name="body" errors={failed?.fieldErrors?.body} defaultValue={failed?.values?.body} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Adding…" variant="secondary">
        Add comment
      </SubmitButton>
    </form>
  );
}

export function ReturnForm({ site }: { site: Site }) {
  const [state, action] = useActionState(returnSubmission, null);
  const failed = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-3">
      <Hidden site={site} />
      <TextArea label="Message to the grower (optional)" name="message" errors={failed?.fieldErrors?.message} defaultValue={failed?.values?.message} hint="Your comments on plots and values are listed in the e-mail too." />
      <FormMessage state={state} />
      <SubmitButton pendingText="Returning…" variant="danger">
        Return with comments
      </SubmitButton>
    </form>
  );
}

export function AcceptForm({ site }: { site: Site }) {
  const [state, action] = useActionState(acceptSubmission, null);
  return (
    <form action={action} className="space-y-3">
      <Hidden site={site} />
      <FormMessage state={state} />
      <SubmitButton pendingText="Accepting…">Accept this data</SubmitButton>
    </form>
  );
}

/** The grower's "send for review" button. */
export function SubmitForReviewForm({ site }: { site: Site }) {
  const [state, action] = useActionState(submitForReview, null);
  const t = useTranslations("record");
  return (
    <form action={action} className="space-y-3">
      <Hidden site={site} />
      <FormMessage state={state} />
      <SubmitButton pendingText={t("sending")}>{t("sendForReview")}</SubmitButton>
    </form>
  );
}
