"use client";
import { useActionState } from "react";
import { SelectField, TextField } from "@/components/ui/field";
import { CheckboxField } from "@/components/ui/checkbox-field";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";
import { Badge } from "@/components/ui/badge";
import type { Tone } from "@/lib/domain/vocabulary/statuses";
import { publishTrial, unpublishTrial } from "@/server/actions/publish";

export interface SiteInclusionRow {
  siteId: number;
  siteName: string;
  included: boolean;
  words: string;
  tone: Tone;
}

/** Each enrolled site, included in the next version or not and why. */
export function SiteInclusionList({ sites }: { sites: SiteInclusionRow[] }) {
  if (sites.length === 0) return <p className="text-loam-700">No site is enrolled in this trial.</p>;
  const included = sites.filter((s) => s.included).length;
  return (
    <div className="space-y-3">
      <p>
        The next version will include {included} of {sites.length} {sites.length === 1 ? "site" : "sites"}: only accepted data are published.
      </p>
      <ul className="space-y-2" aria-label="Sites in the next version">
        {sites.map((s) => (
          <li key={s.siteId} className="flex flex-wrap items-center justify-between gap-2 border-b border-husk-100 pb-2">
            <span className="font-semibold">{s.siteName}</span>
            <Badge tone={s.tone}>{s.words}</Badge>
          </li>
        ))}
      </ul>
    </div>
  );
}

export function PublishForm({ trialId, traits, nextVersion, leftOut }: { trialId: number; traits: { id: number; name: string }[]; nextVersion: number; leftOut: { siteId: number; siteName: string }[] }) {
  const [state, action] = useActionState(publishTrial, null);
  const failed = state && !state.ok ? state : null;
  const leftOutNames = leftOut.map((s) => s.siteName).join(", ");
  const confirmErrors = failed?.fieldErrors?.confirmLeftOut;
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
      <CheckboxField
        label="Also publish the REML mixed model"
        name="mixed"
        defaultChecked={failed?.values?.mixed === "on"}
        hint="Adds to the report and downloads each trait's variance components (how much sites differ, how much varieties change rank between them) and means with SE from the mixed model."
      />
      <CheckboxField
        label="Add stability across sites to the PDF report"
        name="stabilityInReport"
        defaultChecked={failed?.values?.stabilityInReport === "on"}
        hint="Each variety's response to better and poorer sites, for traits analysed at 3 or more sites."
      />
      <TextField
        label={nextVersion > 1 ? "What changed since the last version (required)" : "Note (optional)"}
        name="changeNote"
        defaultValue={failed?.values?.changeNote}
        errors={failed?.fieldErrors?.changeNote}
      />
      {leftOut.length > 0 && (
        <div className="rounded-lg border border-marigold-400 bg-marigold-100 p-3">
          <div className="flex items-start gap-2">
            <input
              id="confirmLeftOut"
              name="confirmLeftOut"
              type="checkbox"
              value={leftOut.map((s) => s.siteId).join(",")}
              className="mt-1 size-5 shrink-0 accent-sprout-600"
              aria-invalid={confirmErrors ? true : undefined}
              aria-describedby={confirmErrors ? "confirmLeftOut-error" : "confirmLeftOut-hint"}
            />
            <label htmlFor="confirmLeftOut" className="text-sm">
              <span className="font-semibold">
                Publish without {leftOutNames}.
              </span>
              <span id="confirmLeftOut-hint" className="block text-loam-700">
                {leftOut.length === 1 ? "This site is" : "These sites are"} not in version {nextVersion}; the public page names {leftOut.length === 1 ? "it" : "them"} as not included.
                A later version can add {leftOut.length === 1 ? "it" : "them"} once the data are accepted.
              </span>
            </label>
          </div>
          {confirmErrors && (
            <p id="confirmLeftOut-error" className="mt-2 text-sm font-medium text-beet-700">
              {confirmErrors[0]}
            </p>
          )}
        </div>
      )}
      <p className="text-sm text-loam-700">
        Publishing freezes the accepted data and results as version {nextVersion}, reveals the variety names behind the blind codes,
        and e-mails the growers of the included sites that their site&apos;s results are out.
        {leftOut.length > 0 && " Growers whose sites are left out get a short note saying their site is not in this version."}
      </p>
      <FormMessage state={state} />
      <SubmitButton pendingText="Publishing…">Publish version {nextVersion}</SubmitButton>
    </form>
  );
}

/**
 * Withdraws the live version. It stays on the page once nothing is live any more (the withdrawal refreshes
 * the page), so the confirmation is still read after the form itself has gone.
 */
export function UnpublishForm({ trialId, live }: { trialId: number; live: boolean }) {
  const [state, action] = useActionState(unpublishTrial, null);
  const failed = state && !state.ok ? state : null;
  if (!live) return state?.ok ? <FormMessage state={state} /> : <p className="text-loam-700">No version is public, so there is nothing to withdraw.</p>;
  return (
    <form action={action} noValidate className="space-y-4">
      <input type="hidden" name="trialId" value={trialId} />
      <TextField label="Why are the results withdrawn?" name="reason" hint="Shown on the public page in place of the results." defaultValue={failed?.values?.reason} errors={failed?.fieldErrors?.reason} />
      <FormMessage state={state} />
      <SubmitButton variant="danger" pendingText="Withdrawing…">Withdraw the results</SubmitButton>
    </form>
  );
}
