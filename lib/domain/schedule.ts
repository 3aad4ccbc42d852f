// When observations fall due at a site: pure date arithmetic over the site's own sowing date.

export type DueStatus = "done" | "late" | "due_today" | "upcoming";

export interface DueItem {
  traitId: number;
  traitName: string;
  occasion: number;
  dueOn: string; // ISO date
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

/**
 * Lists the scheduled counts of one site: one item per trait and day after sowing, with how many plots
 * already have a value. A site with no sowing date has nothing due yet.
 */
export function scheduleForSite(p: {
  sownOn: string | null;
  plotCount: number;
  traits: { id: number; name: string; dueDaysAfterSowing: number[] | null }[];
  recorded: Map<string, number>; // key `${traitId}:${occasion}`
  today: string;
}): DueItem[] {
  if (!p.sownOn || p.plotCount === 0) return [];
  const items: DueItem[] = [];
  for (const trait of p.traits) {
    for (const day of trait.dueDaysAfterSowing ?? []) {
      const dueOn = addDays(p.sownOn, day);
      const recorded = p.recorded.get(`${trait.id}:${day}`) ?? 0;
      const status: DueStatus = recorded >= p.plotCount ? "done" : dueOn < p.today ? "late" : dueOn === p.today ? "due_today" : "upcoming";
      items.push({ traitId: trait.id, traitName: trait.name, occasion: day, dueOn, expected: p.plotCount, recorded, status });
    }
  }
  return items.sort((a, b) => a.dueOn.localeCompare(b.dueOn) || a.traitName.localeCompare(b.traitName));
}
