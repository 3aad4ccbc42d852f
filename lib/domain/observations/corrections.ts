/**
 * A change to a recorded value as the review page tells it: the plot, the column by its name (the audit
 * entry stores the column's key, e.g. `marketable_yield`), the old and new value, who and when.
 */
import { formatDateTime } from "@/lib/domain/vocabulary/labels";
import type { EntryColumn } from "./columns";

export interface StoredValueChange {
  at: Date;
  actor: string | null;
  oldValue: unknown;
  newValue: unknown;
}

export interface Correction {
  plotCode: string;
  column: string;
  from: string;
  to: string;
  by: string;
  when: string;
  fromUpload: boolean;
}

const text = (v: unknown): string => (typeof v === "string" ? v : "");

export function describeCorrections(changes: StoredValueChange[], columns: Pick<EntryColumn, "key" | "name">[]): Correction[] {
  const names = new Map(columns.map((c) => [c.key, c.name]));
  return changes.map((c) => {
    const old = (c.oldValue ?? {}) as Record<string, unknown>;
    const next = (c.newValue ?? {}) as Record<string, unknown>;
    const key = text(old.column) || text(next.column);
    return {
      plotCode: text(old.plot) || text(next.plot),
      // a column since removed from the trial keeps its key rather than vanishing from the record
      column: names.get(key) ?? key,
      from: text(old.value) || "—",
      to: text(next.value) || "—",
      by: c.actor ?? "someone",
      when: formatDateTime(c.at),
      fromUpload: next.source === "upload",
    };
  });
}
