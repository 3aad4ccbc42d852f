import type { EntryColumn } from "./columns";
import type { CellValue } from "./values";
import { datesToCheck, type DateCheckKind, type SiteDates } from "./date-order";

// Values a coordinator should look at before accepting a site's data. Pure, over one site's values.

export interface Flag {
  plotId: number;
  key: string;
  kind: "out_of_range" | "far_from_entry" | DateCheckKind;
  message: string;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

/**
 * Flags values outside the trait's range, and values far from the other plots of the same entry at the
 * site: the distance to the entry's median must exceed 3.5 robust standard deviations (1.4826 × the median
 * absolute distance over all plots of the column) and 20% of that median. A screening rule of thumb
 * (common practice), not a test; entries with fewer than three values are not judged. With `dates`, also
 * harvest and maturity dates out of order or far from the packet's days to maturity (`datesToCheck`),
 * worded for staff.
 */
export function flagValues(p: {
  columns: EntryColumn[];
  plots: { id: number; blindCode: string; plotCode: string }[];
  values: Record<number, Record<string, CellValue>>;
  dates?: { site: SiteDates; packetDays: Record<number, number | null> };
}): Flag[] {
  const flags: Flag[] = [];
  if (p.dates) {
    for (const plot of p.plots) {
      const found = datesToCheck({ columns: p.columns, value: (key) => p.values[plot.id]?.[key], site: p.dates.site, packetDays: p.dates.packetDays[plot.id] ?? null, audience: "staff" });
      for (const w of found) flags.push({ plotId: plot.id, key: w.key, kind: w.kind, message: w.message });
    }
  }
  for (const c of p.columns) {
    if (c.valueType !== "count" && c.valueType !== "number" && c.valueType !== "rating") continue;
    const points = p.plots
      .map((plot) => ({ plot, x: p.values[plot.id]?.[c.key]?.valueNumber ?? null }))
      .filter((v): v is { plot: (typeof p.plots)[number]; x: number } => v.x !== null);
    for (const v of points) {
      if ((c.min !== null && v.x < c.min) || (c.max !== null && v.x > c.max)) {
        flags.push({ plotId: v.plot.id, key: c.key, kind: "out_of_range", message: `${v.x} is outside the valid range ${c.min ?? "…"} to ${c.max ?? "…"}.` });
      }
    }
    const byEntry = new Map<string, number[]>();
    for (const v of points) byEntry.set(v.plot.blindCode, [...(byEntry.get(v.plot.blindCode) ?? []), v.x]);
    const residuals = points
      .filter((v) => byEntry.get(v.plot.blindCode)!.length >= 3)
      .map((v) => ({ v, med: median(byEntry.get(v.plot.blindCode)!) }));
    if (residuals.length < 6) continue;
    // Small counts and ratings often sit exactly on their entry's median, which makes the robust spread 0 and
    // would flag every difference; one unit (one seedling, one rating step) is the floor.
    const unit = c.valueType === "number" ? 0 : 1;
    const scale = Math.max(1.4826 * median(residuals.map((r) => Math.abs(r.v.x - r.med))), unit);
    for (const r of residuals) {
      const gap = Math.abs(r.v.x - r.med);
      if (gap > 0 && gap >= 3.5 * scale && gap >= 0.2 * Math.max(Math.abs(r.med), 1)) {
        const others = points.filter((o) => o.plot.blindCode === r.v.plot.blindCode && o.plot.id !== r.v.plot.id).map((o) => o.x);
        flags.push({
          plotId: r.v.plot.id,
          key: c.key,
          kind: "far_from_entry",
          message: `${r.v.x} is far from the other plots of code ${r.v.plot.blindCode} at this site (${others.join(", ")}).`,
        });
      }
    }
  }
  return flags;
}
