import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireRole } from "@/server/auth/guards";
import { getTrialDetail, getTrialLineage, listEnrolableSites, listEntryOptions } from "@/db/queries/trials";
import { RollForwardForm } from "@/components/trials/roll-forward-form";
import { PlanningPanel } from "@/components/trials/planning-panel";
import { listPlanningSources } from "@/db/queries/planning";
import { TraitOrder } from "@/components/trials/trait-order";
import { idParam } from "@/lib/validation/common";
import { Card } from "@/components/ui/card";
import { TrialStatusBadge } from "@/components/ui/status-badge";
import { AddEntryForm, EnrolSiteForm, StatusButton } from "@/components/trials/trial-controls";
import { TrialEntriesCard, TrialSitesCard } from "@/components/trials/trial-panels";
import { QueryProvider } from "@/components/ui/query-provider";
import { asJson } from "@/lib/domain/json";
import { DESIGN_LABELS, PLOT_UNIT_LABELS } from "@/lib/domain/vocabulary/labels";
import { canEditDesign, canEnrolSites, canPublish, designLockReason, nextStatus, STAGE_MEANINGS } from "@/lib/domain/design/status";
import { TRIAL_STATUSES } from "@/lib/domain/vocabulary/enums";
import { STATUS_LABELS } from "@/lib/domain/vocabulary/statuses";

export const metadata: Metadata = { title: "Trial" };

export default async function TrialPage({ params }: { params: Promise<{ trialId: string }> }) {
  const viewer = await requireRole("coordinator", "admin");
  const trialId = idParam.safeParse((await params).trialId);
  if (!trialId.success) notFound();
  const detail = await getTrialDetail(viewer, trialId.data);
  if (!detail) notFound();
  const { trial, entries, traits, progress } = detail;
  // Entries and sites are client components that refetch this from GET /api/trials/:id after each change.
  const initial = asJson(detail);
  const state = { status: trial.status, ...progress };
  const editable = canEditDesign(state);
  // Planning the size matters while the design can still change.
  const planning = trial.status === "draft" || trial.status === "open";
  const [varietyOptions, enrolable, lineage, planningSources] = await Promise.all([
    editable ? listEntryOptions(viewer, trial.id) : Promise.resolve([]),
    canEnrolSites(state) ? listEnrolableSites(viewer, trial.id) : Promise.resolve([]),
    getTrialLineage(viewer, trial.id),
    planning ? listPlanningSources(viewer, trial.id) : Promise.resolve([]),
  ]);
  const taken = new Set(entries.map((e) => e.variety));
  const next = nextStatus(trial.status);
  const plotUnit = trial.plotUnit === "bed_row" ? `bed row of ${trial.plotSize} plants` : trial.plotUnit === "cells" ? `${trial.plotSize} cells` : "one six-cell insert";

  return (
    <QueryProvider>
      <div className="space-y-6">
        <p className="text-sm">
          <Link href="/portal/trials">← Trials</Link>
        </p>
        <div className="flex flex-wrap items-start justify-between gap-3">
          <div>
            <h1 className="text-3xl font-bold">{trial.title}</h1>
            <p className="text-loam-700">
              <span className="font-mono">{trial.code}</span> · {trial.crop} · {trial.season} · {trial.program}
            </p>
            {lineage?.previous && (
              <p className="text-sm">
                Planned from <Link href={`/portal/trials/${lineage.previous.id}`}>{lineage.previous.title} ({lineage.previous.code})</Link>
              </p>
            )}
            {lineage && lineage.next.length > 0 && (
              <p className="text-sm">
                Followed by{" "}
                {lineage.next.map((n, i) => (
                  <span key={n.id}>
                    {i > 0 && ", "}
                    <Link href={`/portal/trials/${n.id}`}>
                      {n.title} ({n.code})
                    </Link>
                  </span>
                ))}
              </p>
            )}
          </div>
          <div className="flex items-center gap-3">
            {(trial.status === "draft" || trial.status === "open") && <Link href={`/portal/trials/${trial.id}/edit`}>Edit details</Link>}
            {progress.observationCount > 0 && <Link href={`/portal/trials/${trial.id}/analysis`}>Analysis</Link>}
            {canPublish(trial.status) && <Link href={`/portal/trials/${trial.id}/publish`}>Publish</Link>}
            <TrialStatusBadge status={trial.status} />
          </div>
        </div>

        <div className="grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
          <Card title="Design">
            <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2">
              <div>
                <dt className="font-semibold">Design</dt>
                <dd>{DESIGN_LABELS[trial.design]}</dd>
              </div>
              <div>
                <dt className="font-semibold">{trial.design === "rcbd" ? "Blocks per site" : "Replicates per site"}</dt>
                <dd>{trial.blocks}</dd>
              </div>
              <div>
                <dt className="font-semibold">Plot unit</dt>
                <dd>
                  {PLOT_UNIT_LABELS[trial.plotUnit]} ({plotUnit})
                </dd>
              </div>
              <div>
                <dt className="font-semibold">Seeds per cell</dt>
                <dd>{trial.seedsPerCell}</dd>
              </div>
              {trial.purpose && (
                <div className="sm:col-span-2">
                  <dt className="font-semibold">Purpose</dt>
                  <dd>{trial.purpose}</dd>
                </div>
              )}
              <div className="sm:col-span-2">
                <dt className="font-semibold">Traits, in the order growers record them</dt>
                <dd>
                  <TraitOrder trialId={trial.id} traits={traits} editable={trial.status !== "archived"} />
                </dd>
              </div>
            </dl>
          </Card>
          <Card title="Status">
            <ol className="mb-3 space-y-1 text-sm">
              {TRIAL_STATUSES.map((s) => (
                <li key={s} aria-current={s === trial.status ? "step" : undefined} className={s === trial.status ? "rounded-lg bg-sprout-50 p-2 font-semibold" : "px-2 text-loam-700"}>
                  {STATUS_LABELS[s]}
                  {s === trial.status ? " (now)" : ""}: <span className="font-normal">{STAGE_MEANINGS[s]}</span>
                </li>
              ))}
            </ol>
            <p className="mb-3 text-sm text-loam-700">{designLockReason(state) ?? "Entries and design can still change."}</p>
            <div className="flex flex-wrap gap-2">
              {next && <StatusButton trialId={trial.id} to={next} />}
              {trial.status === "open" && progress.randomisedSites === 0 && <StatusButton trialId={trial.id} to="draft" label="Back to draft" />}
            </div>
          </Card>
        </div>

        <div className="grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
          <TrialEntriesCard trialId={trial.id} initial={initial} lotOptions={Object.fromEntries(varietyOptions.map((v) => [v.id, v.lots]))} />
          <Card title="Add an entry">
            {editable ? (
              <AddEntryForm trialId={trial.id} varieties={varietyOptions.filter((v) => !taken.has(v.name))} />
            ) : (
              <p className="text-sm text-loam-700">{designLockReason(state)}</p>
            )}
          </Card>
        </div>

        <div className="grid gap-6 lg:grid-cols-[2fr_1fr] [&>*]:min-w-0">
          <TrialSitesCard trialId={trial.id} initial={initial} />
          <Card title="Enrol a site">
            {canEnrolSites(state) ? (
              enrolable.length ? (
                <EnrolSiteForm trialId={trial.id} sites={enrolable} />
              ) : (
                <p className="text-sm text-loam-700">
                  Every site is enrolled. <Link href="/portal/sites">Add a site</Link>
                </p>
              )
            ) : (
              <p className="text-sm text-loam-700">Sites can no longer join this trial.</p>
            )}
          </Card>
        </div>

        {planning && (
          <Card title="How many blocks does this trial need?">
            <PlanningPanel trialId={trial.id} initial={initial} blocks={trial.blocks} sources={planningSources} previousTrialId={lineage?.previous?.id ?? null} />
          </Card>
        )}

        {lineage && lineage.seasons.length > 0 && (
          <Card title="Plan next season from this trial">
            <RollForwardForm trialId={trial.id} title={trial.title} seasons={lineage.seasons} />
          </Card>
        )}
      </div>
    </QueryProvider>
  );
}
