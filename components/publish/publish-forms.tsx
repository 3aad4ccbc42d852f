"use client";
import { useActionState } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { publishTrial, unpublishTrial } from "@/server/actions/publish";

export function PublishForm({ trialId, traits, nextVersion }: { trialId: number; traits: { id: number; name: string }[]; nextVersion: number }) {
  const [state, action] = useActionState(publishTrial, null);
  const failed = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="trialId" value={trialId} />
      <SelectField label="What to publish" name="traitId" defaultValue={failed?.values?.traitId ?? "all"} errors={failed?.fieldErrors?.traitId}>
        <option value="all">The whole trial (every trait with data)</option>
        {traits.map((t) => (
          <option key={t.id} value={t.id}>
            Only {t.name}
          </option>
        ))}
      </SelectField>
      <SelectField label="Sites are" name="siteModel" defaultValue={failed?.values?.siteModel ?? "random"} hint="Random: the sites stand for farms like them (the usual choice). Fixed: conclusions hold for these sites only." errors={failed?.fieldErrors?.siteModel}>
        <option value="random">Random (a sample of farms)</option>
        <option value="fixed">Fixed (these sites only)</option>
      </SelectField>
      <SelectField label="Mean separation" name="separation" defaultValue={failed?.values?.separation ?? "lsd"} hint="Protected LSD finds more differences; Tukey keeps the chance of any false difference at 5%." errors={failed?.fieldErrors?.separation}>
        <option value="lsd">Protected LSD (0.05)</option>
        <option value="tukey">Tukey HSD (0.05)</option>
      </SelectField>
      <TextField
        label={nextVersion > 1 ? "What changed since the last version (required)" : "Note (optional)"}
        name="changeNote"
        defaultValue={failed?.values?.changeNote}
        errors={failed?.fieldErrors?.changeNote}
      />
      <p className="text-sm text-loam-700">
        Publishing freezes the accepted data and results as version {nextVersion}, reveals the variety names behind the blind codes,
        and e-mails the growers of the enrolled sites.
      </p>
      <FormMessage state={state} />
      <SubmitButton pendingText="Publishing…">Publish version {nextVersion}</SubmitButton>
    </form>
  );
}

export function UnpublishForm({ trialId }: { trialId: number }) {
  const [state, action] = useActionState(unpublishTrial, null);
  const failed = state && !state.ok ? state : null;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="trialId" value={trialId} />
      <TextField label="Why are the results withdrawn?" name="reason" hint="Shown on the public page in place of the results." defaultValue={failed?.values?.reason} errors={failed?.fieldErrors?.reason} />
      <FormMessage state={state} />
      <SubmitButton variant="danger" pendingText="Withdrawing…">Withdraw the results</SubmitButton>
    </form>
  );
}
