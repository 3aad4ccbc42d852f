// When observations fall due at a site: pure date arithmetic over the site's own sowing date.

import type { EntryColumn } from "@/lib/domain/observations/columns";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

/**
 * done: every plot has a value (or a reason it has none); late: its day has passed; due_today;
 * due_soon: within DUE_SOON_DAYS; upcoming: later; at_event: timed by an event such as harvest, so it
 * has no date but is still owed.
 */
export type DueStatus = "done" | "late" | "due_today" | "due_soon" | "upcoming" | "at_event";

/** How far ahead "due soon" looks (a week: common practice for field reminders). */
export const DUE_SOON_DAYS = 7;

export interface DueItem {
  traitId: number;
  traitName: string;
  occasion: number;
  /** what people call it: "Seedlings emerged (count), day 5", "Seeds sown", "Marketable yield" */
  label: string;
  /** ISO date, or null for a trait timed by an event */
  dueOn: string | null;
  /** when it is due in words: "day 14 after sowing", "at first marketable harvest" */
  when: string;
  expected: number;
  recorded: number;
  status: DueStatus;
}

/** Adds whole days to an ISO date (YYYY-MM-DD), in UTC so no time zone shifts the day. */
export function addDays(isoDate: string, days: number): string {
  const d = new Date(`${isoDate}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** Today's date as YYYY-MM-DD in UTC. */
export const todayIso = (now: Date = new Date()) => now.toISOString().slice(0, 10);

export type ScheduleColumn = Pick<EntryColumn, "traitId" | "name" | "occasion" | "dueDay" | "dueNote" | "valueType"> & { traitName?: string };

/**
 * Everything owed at one site, one item per column of the recording form (a trait on a scheduled day, or
 * a trait recorded once), with how many plots already have a value. Free-text notes are never owed. A
 * site with no sowing date or no plots has nothing dated yet, and says so through `undatedReason`.
 */
export function scheduleForSite(p: {
  sownOn: string | null;
  plotCount: number;
  columns: readonly ScheduleColumn[];
  recorded: Map<string, number>; // key `${traitId}:${occasion}`
  today: string;
  /** The reader's language for `when` and labels; English when absent. */
  t?: Translator;
}): DueItem[] {
  const t = p.t ?? translatorFor();
  if (!p.sownOn || p.plotCount === 0) return [];
  const soon = addDays(p.today, DUE_SOON_DAYS);
  const items: DueItem[] = [];
  for (const c of p.columns) {
    if (c.valueType === "text") continue;
    const recorded = p.recorded.get(`${c.traitId}:${c.occasion}`) ?? 0;
    const dueOn = c.dueDay === null ? null : addDays(p.sownOn, c.dueDay);
    const status: DueStatus =
      recorded >= p.plotCount
        ? "done"
        : dueOn === null
          ? "at_event"
          : dueOn < p.today
            ? "late"
            : dueOn === p.today
              ? "due_today"
              : dueOn <= soon
                ? "due_soon"
                : "upcoming";
    const traitName = c.traitName ?? c.name.replace(/ day \d+$/, "");
    items.push({
      traitId: c.traitId,
      traitName,
      occasion: c.occasion,
      label: c.name === traitName ? traitName : `${traitName}, day ${c.occasion}`,
      dueOn,
      when: c.dueDay === null ? (c.dueNote ?? t("schedule.whenItHappens")).replace(/^./, (ch) => ch.toLowerCase()) : t("schedule.daysAfterSowing", { day: String(c.dueDay) }),
      expected: p.plotCount,
      recorded,
      status,
    });
  }
  // Dated items by date, then the ones an event times, in form order.
  return items.sort((a, b) => (a.dueOn === null ? 1 : 0) - (b.dueOn === null ? 1 : 0) || (a.dueOn ?? "").localeCompare(b.dueOn ?? ""));
}

/** One site's schedule in the few numbers a home page shows. */
export function scheduleSummary(items: readonly DueItem[]) {
  const owed = items.filter((i) => i.status !== "done");
  return {
    late: owed.filter((i) => i.status === "late"),
    dueToday: owed.filter((i) => i.status === "due_today"),
    dueSoon: owed.filter((i) => i.status === "due_soon"),
    atEvent: owed.filter((i) => i.status === "at_event"),
    next: owed.find((i) => i.status !== "late") ?? null,
    values: { recorded: items.reduce((n, i) => n + Math.min(i.recorded, i.expected), 0), expected: items.reduce((n, i) => n + i.expected, 0) },
    /** true only when every value the form asks for is in */
    allIn: items.length > 0 && owed.length === 0,
  };
}
