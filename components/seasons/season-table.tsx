"use client";
import { useMemo, useState } from "react";
import Link from "next/link";
import type { ColumnDef } from "@tanstack/react-table";
import { DataTable } from "@/components/ui/data-table";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { ConfirmAction } from "@/components/ui/confirm-action";
import { SeasonStateBadge } from "@/components/ui/status-badge";
import { EditSeasonForm } from "@/components/seasons/season-forms";
import { closeOrReopenSeason } from "@/server/actions/seasons";
import { SEASON_STATE_LABELS } from "@/lib/domain/vocabulary/statuses";
import type { SeasonListRow } from "@/db/queries/seasons";

type Notify = (text: string) => void;

function SeasonActions({ season, notify }: { season: SeasonListRow; notify: Notify }) {
  const [editing, setEditing] = useState(false);
  return (
    <div className="flex flex-wrap gap-1 whitespace-nowrap">
      <Button type="button" variant="ghost" onClick={() => setEditing(true)}>
        Edit<span className="sr-only"> {season.name}</span>
      </Button>
      {season.closed ? (
        <ConfirmAction
          label="Reopen season"
          srLabel={season.name}
          title={`Reopen ${season.name}?`}
          confirmLabel="Reopen season"
          confirmVariant="primary"
          action={closeOrReopenSeason}
          fields={{ seasonId: season.id, closed: "false" }}
          onDone={(r) => r.ok && notify(r.message ?? "Season reopened.")}
        >
          <p>New trials can then be set up in {season.name} again.</p>
        </ConfirmAction>
      ) : (
        <ConfirmAction
          label="Close season"
          srLabel={season.name}
          title={`Close ${season.name}?`}
          confirmLabel="Close season"
          action={closeOrReopenSeason}
          fields={{ seasonId: season.id, closed: "true" }}
          onDone={(r) => r.ok && notify(r.message ?? "Season closed.")}
        >
          <p>A closed season takes no new trials and is no longer offered on the new-trial form.</p>
          <p>Its {season.trials === 1 ? "trial carries" : `${season.trials} trials carry`} on as before: growers keep recording and you can still review and publish. You can reopen the season later.</p>
        </ConfirmAction>
      )}
      {editing && (
        <Dialog title={`Edit ${season.name}`} onClose={() => setEditing(false)}>
          <EditSeasonForm
            season={season}
            onSaved={(message) => {
              setEditing(false);
              notify(message);
            }}
          />
        </Dialog>
      )}
    </div>
  );
}

const dates = (s: SeasonListRow) => (s.startsOn && s.endsOn ? `${s.startsOn} to ${s.endsOn}` : s.startsOn ? `from ${s.startsOn}` : s.endsOn ? `until ${s.endsOn}` : "Not set");

/** The seasons of the viewer's programs, with their state and the controls to edit, close or reopen them. */
export function SeasonTable({ rows, showProgram }: { rows: SeasonListRow[]; showProgram: boolean }) {
  const [notice, setNotice] = useState<string | null>(null);
  const columns = useMemo<ColumnDef<SeasonListRow, unknown>[]>(
    () => [
      { id: "name", header: "Season", accessorFn: (s) => s.name, cell: (c) => <span className="font-semibold">{c.row.original.name}</span> },
      ...(showProgram ? [{ id: "program", header: "Program", accessorFn: (s: SeasonListRow) => s.program } satisfies ColumnDef<SeasonListRow, unknown>] : []),
      { id: "year", header: "Year", accessorFn: (s) => s.year },
      {
        id: "dates",
        header: "Dates",
        accessorFn: dates,
        // Each date stays on one line; the words between may wrap.
        cell: (c) =>
          dates(c.row.original)
            .split(" ")
            .map((part, i) => (
              <span key={i} className="whitespace-nowrap">
                {i > 0 ? " " : ""}
                {part}
              </span>
            )),
      },
      {
        id: "trials",
        header: "Trials",
        accessorFn: (s) => s.trials,
        cell: (c) => (c.row.original.trials > 0 ? <Link href={`/portal/trials?season=${c.row.original.id}`}>{c.row.original.trials} {c.row.original.trials === 1 ? "trial" : "trials"}</Link> : "None yet"),
      },
      {
        id: "state",
        header: "State",
        accessorFn: (s) => SEASON_STATE_LABELS[s.closed ? "closed" : "open"],
        cell: (c) => (
          <span className="inline-flex flex-wrap items-center gap-1">
            <SeasonStateBadge state={c.row.original.closed ? "closed" : "open"} />
            {c.row.original.closedOn && <span className="text-sm text-loam-700">since {c.row.original.closedOn}</span>}
          </span>
        ),
      },
      { id: "actions", header: () => <span className="sr-only">Actions</span>, enableSorting: false, enableGlobalFilter: false, cell: (c) => <SeasonActions season={c.row.original} notify={setNotice} /> },
    ],
    [showProgram],
  );
  return (
    <>
      <div role="status" aria-live="polite" className="mb-3 empty:mb-0">
        {notice && <p className="rounded-lg border border-sprout-500 bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700">{notice}</p>}
      </div>
      <DataTable data={rows} columns={columns} caption="Seasons of your programs" filterLabel="Filter seasons" empty="No seasons yet. Add the first one below." />
    </>
  );
}
