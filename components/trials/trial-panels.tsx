"use client";
import { useState } from "react";
import Link from "next/link";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SETUP_LABELS, formatDate } from "@/lib/domain/vocabulary/labels";
import { canChangeSowingDate, canEditDesign, canRandomiseSite } from "@/lib/domain/design/status";
import { EntryLotForm, RandomiseButton, RemoveEntryButton, SiteNamingForm, SowingDateForm } from "./trial-controls";
import { SiteMap } from "./site-layout-view";
import { useSiteLayout, useTrialDetail, type TrialDetailJson } from "./trial-data";

/** Shows that a refetch is running, or why it failed with a way to try again; the last data stays on screen. */
function FetchState({ what, isFetching, error, retry }: { what: string; isFetching: boolean; error: Error | null; retry: () => void }) {
  return (
    <div aria-live="polite" className="text-sm">
      {error ? (
        <p className="flex flex-wrap items-center gap-2 rounded-lg border border-beet-600 bg-beet-50 px-3 py-1 font-medium text-beet-700">
          <span>
            Could not refresh the {what}: {error.message}
          </span>
          <Button type="button" variant="secondary" onClick={retry}>
            Try again
          </Button>
        </p>
      ) : isFetching ? (
        <p className="text-loam-700">Refreshing…</p>
      ) : null}
    </div>
  );
}

/** The entry list with its blind-code key, kept current from the trial's JSON. */
export function TrialEntriesCard({ trialId, initial, lotOptions = {} }: { trialId: number; initial: TrialDetailJson; lotOptions?: Record<number, { id: number; label: string }[]> }) {
  const { data, isFetching, error, refetch } = useTrialDetail(trialId, initial);
  const { trial, entries, progress } = data;
  const editable = canEditDesign({ status: trial.status, ...progress });
  return (
    <Card title={`Entries and blind-code key (${entries.length})`} actions={<FetchState what="entries" isFetching={isFetching} error={error} retry={() => void refetch()} />}>
      <p className="mb-2 text-sm text-loam-700">Only coordinators see this key. Growers see the codes only.</p>
      {entries.length === 0 ? (
        <p className="text-loam-700">No entries yet.</p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Entries with their blind codes</caption>
            <thead className="border-b border-husk-200 text-loam-700">
              <tr>
                <th scope="col" className="py-2 pr-3">#</th>
                <th scope="col" className="py-2 pr-3">Code</th>
                <th scope="col" className="py-2 pr-3">Variety</th>
                <th scope="col" className="py-2 pr-3">Seed lot</th>
                {editable && (
                  <th scope="col" className="py-2">
                    <span className="sr-only">Actions</span>
                  </th>
                )}
              </tr>
            </thead>
            <tbody>
              {entries.map((e) => (
                <tr key={e.id} className="border-b border-husk-100 align-top">
                  <td className="py-2 pr-3 tabular-nums">{e.entryNumber}</td>
                  <td className="py-2 pr-3 font-mono text-base font-bold">{e.blindCode}</td>
                  <td className="py-2 pr-3">
                    {e.variety} {e.isCheck && <Badge tone="info">Check</Badge>}
                  </td>
                  <td className="py-2 pr-3">
                    {editable ? (
                      <EntryLotForm trialId={trial.id} entryId={e.id} variety={e.variety} lots={lotOptions[e.varietyId] ?? []} current={e.seedLotId ?? null} />
                    ) : e.lotCode ? (
                      `${e.source} · ${e.lotCode}`
                    ) : (
                      "—"
                    )}
                    {e.labelGerminationPct !== null && <span className="block text-loam-700">Label germination {e.labelGerminationPct}%</span>}
                    {e.treated && <Badge tone="warn">Treated</Badge>}
                  </td>
                  {editable && (
                    <td className="py-1">
                      <RemoveEntryButton trialId={trial.id} entryId={e.id} label={e.variety} />
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Card>
  );
}

/** One site's flats or rows, fetched from the layout route when the coordinator opens it. */
function SiteLayoutPreview({ trialId, siteId, siteName }: { trialId: number; siteId: number; siteName: string }) {
  const { data, error, isPending, isFetching, refetch } = useSiteLayout(trialId, siteId);
  if (isPending) {
    return (
      <div role="status" className="space-y-2">
        <p className="text-sm text-loam-700">Loading the layout of {siteName}…</p>
        <div aria-hidden className="h-32 max-w-3xl animate-pulse rounded-lg bg-husk-100" />
      </div>
    );
  }
  if (error && !data) {
    return (
      <div role="alert" className="flex flex-wrap items-center gap-2 rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 text-sm font-medium text-beet-700">
        <span>{error.message}</span>
        <Button type="button" variant="secondary" onClick={() => void refetch()}>
          Try again
        </Button>
      </div>
    );
  }
  const flats = new Set(data.plots.map((p) => p.tray).filter((t) => t !== null)).size;
  return (
    <div className="space-y-2" aria-busy={isFetching}>
      <p className="text-sm text-loam-700">
        {flats > 0 ? `Laid out on ${flats} ${flats === 1 ? "flat" : "flats"}.` : `Laid out in ${new Set(data.plots.map((p) => p.block)).size} blocks.`}
        {isFetching ? " Refreshing…" : ""}
      </p>
      <SiteMap layout={data} />
    </div>
  );
}

type SiteJson = TrialDetailJson["sites"][number];

function SiteRow({ trial, site, entryCount, open, setOpen }: { trial: TrialDetailJson["trial"]; site: SiteJson; entryCount: number; open: boolean; setOpen: (open: boolean) => void }) {
  const [editingDate, setEditingDate] = useState(false);
  const [notice, setNotice] = useState<string | null>(null);
  const laidOut = site.randomisedAt !== null;
  const layoutId = `layout-${site.siteId}`;
  return (
    <li className="space-y-3 py-3">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="text-sm">
          <p className="text-base font-semibold">{site.site}</p>
          <p className="text-loam-700">
            {site.region} · {SETUP_LABELS[site.growingSetup]} · grower: {site.cooperator ?? "none yet"} {site.cooperator && site.cooperatorInvited ? <Badge>Invited</Badge> : null}
          </p>
          <p className="flex flex-wrap items-center gap-x-2 text-loam-700">
            <span>Sowing: {formatDate(site.sownOn)}</span>
            {canChangeSowingDate(trial) && (
              <button type="button" className="min-h-11 font-semibold text-sprout-700 underline" aria-expanded={editingDate} onClick={() => setEditingDate((v) => !v)}>
                {editingDate ? "Cancel" : site.sownOn ? "Change" : "Set"}
                <span className="sr-only"> sowing date at {site.site}</span>
              </button>
            )}
          </p>
          {laidOut ? (
            <p>
              {site.plots} plots · seed <span className="font-mono">{site.randomSeed}</span> · <Link href={`/portal/trials/${trial.id}/sites/${site.siteId}`}>Layout and printables</Link>
            </p>
          ) : (
            <p className="text-marigold-800">Not laid out yet</p>
          )}
          {site.observations > 0 && <p className="text-loam-700">{site.observations} values recorded; layout is fixed.</p>}
          {/* a div, not a p: the consent form inside may not sit in a paragraph */}
          <div className="flex flex-wrap items-center gap-x-2 text-loam-700">
            <span>{site.namedInResults ? "Named in public results" : `Published without its name ("Site N, ${site.region}")`}</span>
            <SiteNamingForm trialId={trial.id} siteId={site.siteId} siteName={site.site} named={site.namedInResults} />
          </div>
        </div>
        <div className="flex flex-wrap items-start gap-2">
          {laidOut && (
            <Button type="button" variant="secondary" aria-expanded={open} aria-controls={layoutId} onClick={() => setOpen(!open)}>
              {open ? "Hide layout" : "Show layout"}
              <span className="sr-only"> of {site.site}</span>
            </Button>
          )}
          {canRandomiseSite(trial, site.observations) && entryCount >= 2 && (
            <RandomiseButton trialId={trial.id} siteId={site.siteId} again={laidOut} siteName={site.site} onDone={() => setOpen(true)} />
          )}
        </div>
      </div>
      <div aria-live="polite">{notice && <p className="rounded-lg border border-sprout-500 bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700">{notice}</p>}</div>
      {editingDate && (
        <SowingDateForm
          trialId={trial.id}
          siteId={site.siteId}
          siteName={site.site}
          sownOn={site.sownOn}
          values={site.observations}
          onDone={(message) => {
            setEditingDate(false);
            setNotice(message);
          }}
        />
      )}
      {open && laidOut && (
        <section id={layoutId} aria-label={`Layout of ${site.site}`}>
          <SiteLayoutPreview trialId={trial.id} siteId={site.siteId} siteName={site.site} />
        </section>
      )}
    </li>
  );
}

/** Enrolled sites with their sowing dates and layouts, kept current from the trial's JSON and each site's layout JSON. */
export function TrialSitesCard({ trialId, initial }: { trialId: number; initial: TrialDetailJson }) {
  const { data, isFetching, error, refetch } = useTrialDetail(trialId, initial);
  const [openLayouts, setOpenLayouts] = useState<ReadonlySet<number>>(new Set());
  const { trial, sites, entries } = data;
  const setOpen = (siteId: number, open: boolean) =>
    setOpenLayouts((current) => {
      const next = new Set(current);
      if (open) next.add(siteId);
      else next.delete(siteId);
      return next;
    });
  return (
    <Card title={`Sites (${sites.length})`} actions={<FetchState what="sites" isFetching={isFetching} error={error} retry={() => void refetch()} />}>
      {sites.length === 0 ? (
        <p className="text-loam-700">No sites enrolled yet.</p>
      ) : (
        <ul className="divide-y divide-husk-100">
          {sites.map((s) => (
            <SiteRow key={s.enrolmentId} trial={trial} site={s} entryCount={entries.length} open={openLayouts.has(s.siteId)} setOpen={(open) => setOpen(s.siteId, open)} />
          ))}
        </ul>
      )}
    </Card>
  );
}
