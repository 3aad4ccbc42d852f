/**
 * Germination (final emergence) and emergence speed from the seed counts growers record:
 * seeds sown, final seedlings, and cumulative counts on fixed days after sowing (the occasion).
 */
import {
  checkAgainstLabel,
  emergenceKinetics,
  germinationByEntry,
  germinationHomogeneity,
  germinationHomogeneityBySite,
  germinationVersusLabel,
  isStatsError,
  type GerminationPlot,
} from "@/lib/domain/stats";
import { EMERGED_FINAL_CODE, EMERGENCE_COUNT_CODE, SEEDS_SOWN_CODE } from "@/lib/domain/vocabulary/traits";
import { plural } from "@/lib/domain/vocabulary/words";
import { formatNumber, formatP } from "./format";
import type { AnalysisInput, EmergenceAnalysis, GerminationAnalysis, GerminationRow, InputPlot, LabelComparison } from "./types";

const ALPHA = 0.05;

/** The closing sentence of the germination note; it speaks of the label comparison, so it goes where that goes. */
export const LABEL_COMPARISON_NOTE =
  "Emergence in trays or beds usually runs below a laboratory germination test, and the label tolerances (7 CFR 201.63) are written for laboratory tests, so read the label comparison as a guide.";

interface Counts {
  plot: InputPlot;
  sown: number;
  emerged: number;
  /** cumulative counts by day after sowing, ascending */
  series: { day: number; emerged: number }[];
}

function traitId(input: AnalysisInput, code: string): number | null {
  return input.traits.find((t) => t.code === code)?.id ?? null;
}

/** Seeds sown and seedlings up per plot; plots lacking either are skipped (they are not a germination test). */
function plotCounts(input: AnalysisInput, plots: InputPlot[]): Counts[] {
  const sownId = traitId(input, SEEDS_SOWN_CODE);
  const finalId = traitId(input, EMERGED_FINAL_CODE);
  const countId = traitId(input, EMERGENCE_COUNT_CODE);
  if (sownId === null || (finalId === null && countId === null)) return [];
  const byPlot = new Map<number, { sown: number | null; final: number | null; series: { day: number; emerged: number }[] }>();
  for (const o of input.observations) {
    if (o.valueNumber === null || o.missingReason) continue;
    const rec = byPlot.get(o.plotId) ?? { sown: null, final: null, series: [] };
    if (o.traitId === sownId) rec.sown = o.valueNumber;
    else if (o.traitId === finalId) rec.final = o.valueNumber;
    else if (o.traitId === countId && o.occasion > 0) rec.series.push({ day: o.occasion, emerged: o.valueNumber });
    byPlot.set(o.plotId, rec);
  }
  const out: Counts[] = [];
  for (const plot of plots) {
    const rec = byPlot.get(plot.id);
    if (!rec || rec.sown === null || rec.sown <= 0) continue;
    rec.series.sort((a, b) => a.day - b.day);
    const emerged = rec.final ?? rec.series.at(-1)?.emerged ?? null;
    if (emerged === null) continue;
    out.push({ plot, sown: rec.sown, emerged, series: rec.series });
  }
  return out;
}

/** Germination % with Wilson intervals per entry and per site, chi-square, CMH and the label check. */
export function analyseGermination(input: AnalysisInput, plots: InputPlot[], warnings: string[]): GerminationAnalysis | null {
  const counts = plotCounts(input, plots).filter((c) => {
    if (c.emerged <= c.sown) return true;
    warnings.push(`Plot ${c.plot.plotCode}: ${c.emerged} seedlings from ${c.sown} seeds sown; left out of the germination figures until corrected.`);
    return false;
  });
  if (counts.length === 0) return null;
  const entries = new Map(input.entries.map((e) => [e.id, e]));
  const sites = new Map(input.sites.map((s) => [s.id, s]));
  const gp: GerminationPlot[] = counts.map((c) => ({ entry: String(c.plot.entryId), site: String(c.plot.siteId), sown: c.sown, emerged: c.emerged }));
  const row = (r: ReturnType<typeof germinationByEntry>[number], siteId: number | null): GerminationRow => {
    const e = entries.get(Number(r.entry))!;
    return {
      entryId: e.id,
      blindCode: e.blindCode,
      varietyName: e.varietyName,
      siteId,
      siteName: siteId === null ? null : (sites.get(siteId)?.name ?? null),
      sown: r.sown,
      emerged: r.emerged,
      percent: r.percent,
      lower: r.lower,
      upper: r.upper,
    };
  };
  const order = (a: GerminationRow, b: GerminationRow) => entries.get(a.entryId)!.entryNumber - entries.get(b.entryId)!.entryNumber;
  const byEntry = germinationByEntry(gp).map((r) => row(r, null)).sort(order);
  // one pass to group the plots by site (in the order sites first appear), not one pass per site
  const plotsBySite = new Map<number, GerminationPlot[]>();
  counts.forEach((c, i) => {
    const list = plotsBySite.get(c.plot.siteId);
    if (list) list.push(gp[i]!);
    else plotsBySite.set(c.plot.siteId, [gp[i]!]);
  });
  const siteIds = [...plotsBySite.keys()];
  const bySite = siteIds.flatMap((siteId) =>
    germinationByEntry(plotsBySite.get(siteId)!)
      .map((r) => row(r, siteId))
      .sort(order),
  );

  let chiSquare: GerminationAnalysis["chiSquare"] = null;
  let cmh: GerminationAnalysis["cmh"] = null;
  const noteParts: string[] = [];
  if (byEntry.length >= 2) {
    try {
      const chi = germinationHomogeneity(gp);
      chiSquare = { statistic: chi.statistic, df: chi.df, p: chi.p, lowExpected: chi.lowExpected, cells: chi.expected.length * 2 };
      noteParts.push(
        `Pooled over sites, germination ${chi.p < ALPHA ? "differed" : "did not differ clearly"} between entries (χ² = ${formatNumber(chi.statistic, 2)}, ${chi.df} df, ${formatP(chi.p)}).`,
      );
      if (chi.lowExpected > 0) {
        warnings.push(
          `The germination chi-square table has ${plural(chi.lowExpected, "cell")} with an expected count below 5, so its p-value is only approximate; pool more plots before relying on it.`,
        );
      }
    } catch (e) {
      if (!isStatsError(e)) throw e;
      noteParts.push(`The germination chi-square could not be run: ${e.message}`);
    }
    if (siteIds.length >= 2) {
      try {
        const m = germinationHomogeneityBySite(gp);
        cmh = { statistic: m.statistic, df: m.df, p: m.p, sites: m.sites.length };
        noteParts.push(
          `Allowing for site-to-site differences (Cochran–Mantel–Haenszel over ${m.sites.length} sites), entries ${m.p < ALPHA ? "still differed" : "did not differ clearly"} (${formatP(m.p)}).`,
        );
      } catch (e) {
        if (!isStatsError(e)) throw e;
        noteParts.push(`The stratified test could not be run: ${e.message}`);
      }
    }
  }

  const labels: LabelComparison[] = byEntry.map((r) => {
    const e = entries.get(r.entryId)!;
    const label = e.labelGermination;
    if (label === null) {
      return { entryId: e.id, blindCode: e.blindCode, varietyName: e.varietyName, seedLot: e.seedLot, labelPercent: null, observedPercent: r.percent, sown: r.sown, chiSquareP: null, tolerance: null, withinTolerance: null, note: "Label states no germination (normal for small packets)." };
    }
    let p: number | null = null;
    try {
      p = label > 0 && label < 100 ? (germinationVersusLabel(r.emerged, r.sown, label)?.p ?? null) : null;
    } catch (err) {
      if (!isStatsError(err)) throw err;
    }
    // 7 CFR 201.63 tolerances are defined for tests of 200 seeds or more.
    const check = r.sown >= 200 ? checkAgainstLabel(r.percent, label, r.sown >= 400 ? 400 : 200) : null;
    const note = check
      ? check.withinTolerance
        ? `Within the ${check.tolerance}-point tolerance of the label.`
        : `${formatNumber(check.shortfall, 1)} points below the label, beyond the ${check.tolerance}-point tolerance.`
      : `Fewer than 200 seeds sown, so the label tolerance does not apply.`;
    return { entryId: e.id, blindCode: e.blindCode, varietyName: e.varietyName, seedLot: e.seedLot, labelPercent: label, observedPercent: r.percent, sown: r.sown, chiSquareP: p, tolerance: check?.tolerance ?? null, withinTolerance: check?.withinTolerance ?? null, note };
  });
  noteParts.push(LABEL_COMPARISON_NOTE);
  return { byEntry, bySite, chiSquare, cmh, labels, note: noteParts.join(" ") };
}

/** Emergence curves (cumulative % by day after sowing) and mean emergence time per entry. */
export function analyseEmergence(input: AnalysisInput, plots: InputPlot[], warnings: string[]): EmergenceAnalysis | null {
  // without dated counts there is no curve, so the plots need not be read again
  if (traitId(input, EMERGENCE_COUNT_CODE) === null) return null;
  const counts = plotCounts(input, plots).filter((c) => c.series.length > 0);
  if (counts.length === 0) return null;
  const entries = new Map(input.entries.map((e) => [e.id, e]));
  const days = [...new Set(counts.flatMap((c) => c.series.map((s) => s.day)))].sort((a, b) => a - b);
  const curve: EmergenceAnalysis["curve"] = [];
  const kinetics: EmergenceAnalysis["kinetics"] = [];
  const skipped: string[] = [];
  for (const entry of [...input.entries].sort((a, b) => a.entryNumber - b.entryNumber)) {
    const mine = counts.filter((c) => c.plot.entryId === entry.id);
    if (mine.length === 0) continue;
    for (const day of days) {
      const counted = mine.map((c) => ({ c, s: c.series.find((s) => s.day === day) })).filter((x) => x.s);
      if (counted.length === 0) continue;
      const sown = counted.reduce((a, x) => a + x.c.sown, 0);
      const up = counted.reduce((a, x) => a + x.s!.emerged, 0);
      curve.push({ entryId: entry.id, blindCode: entry.blindCode, varietyName: entry.varietyName, day, percent: (100 * up) / sown, plots: counted.length });
    }
    // Kinetics per plot (each plot's own counts are cumulative), then averaged over plots.
    const perPlot: { met: number | null; t50: number | null; final: number }[] = [];
    for (const c of mine) {
      try {
        const k = emergenceKinetics(c.series, c.sown);
        perPlot.push({ met: k.meanEmergenceTime, t50: k.t50, final: k.finalPercent });
      } catch (e) {
        if (!isStatsError(e)) throw e;
        skipped.push(`${c.plot.plotCode} (${e.message})`);
      }
    }
    const avg = (xs: (number | null)[]) => {
      const v = xs.filter((x): x is number => x !== null);
      return v.length ? v.reduce((a, b) => a + b, 0) / v.length : null;
    };
    kinetics.push({
      entryId: entry.id,
      blindCode: entry.blindCode,
      varietyName: entry.varietyName,
      meanEmergenceTime: avg(perPlot.map((p) => p.met)),
      t50: avg(perPlot.map((p) => p.t50)),
      finalPercent: avg(perPlot.map((p) => p.final)) ?? 0,
      plots: perPlot.length,
    });
  }
  if (skipped.length > 0) warnings.push(`Emergence speed left out ${plural(skipped.length, "plot")} whose counts cannot be read as cumulative: ${skipped.slice(0, 5).join("; ")}${skipped.length > 5 ? "; …" : ""}`);
  const fastest = kinetics.filter((k) => k.meanEmergenceTime !== null).sort((a, b) => a.meanEmergenceTime! - b.meanEmergenceTime!)[0];
  const note = [
    `Counts on days ${days.join(", ")} after sowing.`,
    fastest ? `Fastest mean emergence time: ${fastest.blindCode} at ${formatNumber(fastest.meanEmergenceTime, 1)} days (mean over its plots).` : "",
    "Sites that missed a count contribute fewer plots on that day; mean emergence time uses each plot's counts so far.",
  ]
    .filter(Boolean)
    .join(" ");
  return { days, curve, kinetics, note };
}
