"use client";
import { extremeWord, inStatedOrder, orderWords } from "@/lib/domain/analysis/ranking";
import type { BetterWhen } from "@/lib/domain/vocabulary/enums";

/** Which way is better for the charted trait; without it the charts state the order and claim no best. */
export type ChartDirection = { betterWhen: BetterWhen; computation: string };
const PLAIN: ChartDirection = { betterWhen: "neither", computation: "none" };

/** The entry that comes first among `rows` for the direction: the best one, or the lowest when there is no preference. */
function firstOf<T extends { mean: number; entry: string }>(rows: T[], direction: ChartDirection): T | undefined {
  const sign = direction.betterWhen === "higher" ? -1 : 1;
  return [...rows].sort((a, b) => sign * (a.mean - b.mean))[0];
}
import * as Plot from "@observablehq/plot";
import type { EmergenceAnalysis } from "@/lib/domain/analysis/types";
import { formatNumber } from "@/lib/domain/analysis/format";
import { Chart } from "./chart";
import { ENTRY_COLOURS, ENTRY_SYMBOLS } from "./palette";
import type { EntryLabel, GerminationRowView, MeanRow } from "./analysis-tables";
import { capitalise } from "@/lib/domain/vocabulary/words";

/** One entry's mean at one site, already labelled (blind code or name) by the caller. */
export interface SiteCell {
  siteName: string;
  entry: string;
  mean: number;
}

const INK = "#1b2618";
const leftMargin = (labels: string[], width: number) => Math.min(width < 500 ? 110 : 170, 12 + 7 * Math.max(4, ...labels.map((l) => l.length)));

function entryScales(order: string[]) {
  return {
    color: { type: "ordinal" as const, domain: order, range: [...ENTRY_COLOURS], legend: true },
    symbol: { type: "ordinal" as const, domain: order, range: [...ENTRY_SYMBOLS] },
  };
}

/** Entry means with LSD bars (half an LSD each side: bars that do not overlap differ) or ± SE bars. */
// `order` states how the dots are listed when a caller words it itself; otherwise the direction says it.
// `words` lets a page in another language word the text alternative and format its numbers (the public pages).
export function MeansChart({ means, lsd, label, unit, title, direction = PLAIN, order, testId, words }: { means: MeanRow[]; lsd: number | null; label: EntryLabel; unit: string; title: string; direction?: ChartDirection; order?: string; testId?: string; words?: MeansChartWords }) {
  const rows = inStatedOrder(means).map((m) => {
      const centre = m.lsMean ?? m.mean;
      const half = lsd !== null ? lsd / 2 : m.se;
      return { entry: label(m), centre, low: centre - half, high: centre + half, letter: m.letter ?? "" };
    });
  const number = words?.number ?? ((x: number) => formatNumber(x));
  const values = rows.map((r) => `${r.entry} ${number(r.centre)}${r.letter ? ` (${r.letter})` : ""}`).join("; ");
  const bars = lsd !== null ? `Bars are half an LSD (${formatNumber(lsd)}) each side, so entries whose bars do not overlap differ.` : "Bars are ± one standard error.";
  const summary = words ? words.summary(values, lsd) : `${title}, ${order ?? orderWords(direction)}: ${values}. ${bars}`;
  return (
    <Chart
      title={title}
      summary={summary}
      testId={testId}
      height={Math.max(180, 44 * rows.length + 60)}
      build={(width) => ({
        marginLeft: leftMargin(rows.map((r) => r.entry), width),
        marginRight: 36,
        x: { label: unit, grid: true, nice: true },
        y: { label: null, domain: rows.map((r) => r.entry) },
        marks: [
          Plot.ruleY(rows, { y: "entry", x1: "low", x2: "high", stroke: INK, strokeWidth: 2 }),
          Plot.dot(rows, { y: "entry", x: "centre", r: 6, fill: "#1d4f91", stroke: "white" }),
          Plot.text(rows, { y: "entry", x: "high", text: "letter", dx: 8, textAnchor: "start", fill: INK, fontWeight: 600 }),
        ],
      })}
    />
  );
}

/** The text of a means chart in the page's language: its text alternative from the listed values, and its numbers. */
export interface MeansChartWords {
  number: (x: number) => string;
  summary: (values: string, lsd: number | null) => string;
}

/** Entry means per site, sites ordered from poorest to best: crossing lines are the entry × site interaction. */
export function InteractionChart({ cells, order, unit, direction = PLAIN, words }: { cells: SiteCell[]; order: string[]; unit: string; direction?: ChartDirection; words?: { title: string; summary: (perSite: string) => string } }) {
  const siteMeans = siteMeanMap(cells);
  const sites = [...siteMeans.entries()].sort((a, b) => a[1].mean - b[1].mean).map(([, s]) => s.name);
  // A line joins its points in data order, so the points go in the order of the sites on the axis.
  const data = cells.map((c) => ({ site: c.siteName, entry: c.entry, mean: c.mean })).sort((a, b) => sites.indexOf(a.site) - sites.indexOf(b.site));
  const first = sites.map((site) => `${site}: ${firstOf(data.filter((d) => d.site === site), direction)?.entry ?? "–"}`);
  const firstWords = direction.betterWhen === "neither" ? `${capitalise(extremeWord(direction, "first"))} entry per site` : `Best (${extremeWord(direction, "first")}) entry per site`;
  const summary = words ? words.summary(first.join("; ")) : `Entry means at each site, sites ordered from lowest to highest site mean. ${firstWords} — ${first.join("; ")}. Lines that cross show entries changing places between sites.`;
  return (
    <Chart
      title={words?.title ?? "Entry × site: means at each site"}
      summary={summary}
      testId="interaction-chart"
      height={360}
      build={(width) => ({
        ...rotatedSiteAxis(sites, width),
        y: { label: unit, grid: true, nice: true },
        ...entryScales(order),
        marks: [
          Plot.line(data, { x: "site", y: "mean", stroke: "entry", strokeWidth: 2 }),
          Plot.dot(data, { x: "site", y: "mean", stroke: "entry", fill: "entry", symbol: "entry", r: 4 }),
        ],
      })}
    />
  );
}

const SITE_TICK_CHARS = 18;
const shortSite = (name: string) => (name.length > SITE_TICK_CHARS ? `${name.slice(0, SITE_TICK_CHARS - 1)}…` : name);

/** Slanted site names on x, with margins wide enough that the first and longest names are not cut off. */
function rotatedSiteAxis(sites: string[], width: number) {
  const degrees = width < 600 ? 35 : 15;
  const radians = (degrees * Math.PI) / 180;
  const charWidth = width < 500 ? 6.4 : 7.6; // average px per character at the chart's 11 / 13 px font
  const longest = Math.max(4, ...sites.map((s) => shortSite(s).length)) * charWidth;
  const firstLabel = shortSite(sites[0] ?? "").length * charWidth;
  const step = (width - 76) / Math.max(1, sites.length);
  return {
    marginLeft: Math.round(Math.max(56, firstLabel * Math.cos(radians) - step / 2 + 10)),
    marginBottom: Math.round(28 + longest * Math.sin(radians)),
    x: { domain: sites, label: null, tickRotate: -degrees, tickFormat: shortSite },
  };
}

/** Site means by site name (names are unique). */
function siteMeanMap(cells: SiteCell[]) {
  const sites = new Map<string, { name: string; sum: number; n: number; mean: number }>();
  for (const c of cells) {
    const s = sites.get(c.siteName) ?? { name: c.siteName, sum: 0, n: 0, mean: 0 };
    s.sum += c.mean;
    s.n += 1;
    s.mean = s.sum / s.n;
    sites.set(c.siteName, s);
  }
  return sites;
}

/** Site mean on x, each entry's mean there on y: a steep line is an entry that responds to good sites. */
// `slopes` (from the stability analysis) are written at the end of each line and in the description.
export function SiteResponseChart({ cells, order, unit, direction = PLAIN, slopes }: { cells: SiteCell[]; order: string[]; unit: string; direction?: ChartDirection; slopes?: { entry: string; slope: number }[] }) {
  const siteMeans = siteMeanMap(cells);
  const data = cells.map((c) => ({ siteMean: siteMeans.get(c.siteName)!.mean, site: c.siteName, entry: c.entry, mean: c.mean }));
  const ordered = [...siteMeans.values()].sort((a, b) => a.mean - b.mean);
  const poorest = ordered[0]!;
  const best = ordered.at(-1)!;
  const firstAt = (name: string) => firstOf(data.filter((d) => d.site === name), direction)?.entry ?? "–";
  const firstWords = direction.betterWhen === "neither" ? `${capitalise(extremeWord(direction, "first"))} entry` : `Best (${extremeWord(direction, "first")}) entry`;
  const slopeWords = slopes && slopes.length > 0 ? ` Slopes (1 = average response): ${slopes.map((s) => `${s.entry} ${formatNumber(s.slope, 2)}`).join("; ")}.` : "";
  const summary = `Each site's mean (${formatNumber(poorest.mean)} at ${poorest.name} to ${formatNumber(best.mean)} at ${best.name}) against each entry's mean there, with a straight-line fit per entry. ${firstWords} at the site with the lowest mean: ${firstAt(poorest.name)}; at the highest: ${firstAt(best.name)}.${slopeWords}`;
  const slopeOf = new Map((slopes ?? []).map((s) => [s.entry, s.slope]));
  const lineEnds = slopes ? data.filter((d) => d.site === best.name).map((d) => ({ ...d, text: `${formatNumber(slopeOf.get(d.entry), 2)}` })) : [];
  return (
    <Chart
      title={slopes ? "Site comparison: entry response to site mean (numbers: each entry's slope)" : "Site comparison: entry response to site mean"}
      summary={summary}
      testId="site-response-chart"
      height={340}
      build={() => ({
        marginLeft: 56,
        marginBottom: 44,
        marginRight: slopes ? 44 : 20,
        x: { label: `Site mean (${unit})`, labelAnchor: "center", labelOffset: 38, grid: true, nice: true },
        y: { label: `Entry mean (${unit})`, grid: true, nice: true },
        ...entryScales(order),
        marks: [
          Plot.linearRegressionY(data, { x: "siteMean", y: "mean", stroke: "entry", ci: 0 }),
          Plot.dot(data, { x: "siteMean", y: "mean", stroke: "entry", fill: "entry", symbol: "entry", r: 4 }),
          Plot.text(lineEnds, { x: "siteMean", y: "mean", text: "text", fill: "entry", dx: 8, textAnchor: "start", fontWeight: 600 }),
        ],
      })}
    />
  );
}

/** Pooled emergence % per entry with its 95% Wilson interval; small hollow marks are the single sites. */
export function GerminationChart({ germination, sites, label }: { germination: { byEntry: GerminationRowView[] }; sites: { entry: string; percent: number; site: string }[]; label: EntryLabel }) {
  const pooled = germination.byEntry.map((r) => ({ entry: label(r), percent: r.percent, lower: r.lower, upper: r.upper }));
  const summary = `Emergence per entry, pooled over sites, with 95% intervals: ${pooled.map((p) => `${p.entry} ${formatNumber(p.percent, 1)}% (${formatNumber(p.lower, 1)}–${formatNumber(p.upper, 1)})`).join("; ")}. Hollow marks show each site.`;
  return (
    <Chart
      title="Emergence % per entry and site"
      summary={summary}
      testId="germination-chart"
      height={Math.max(180, 44 * pooled.length + 60)}
      build={(width) => ({
        marginLeft: leftMargin(pooled.map((p) => p.entry), width),
        x: { label: "Emerged (% of seeds sown)", domain: [0, 100], grid: true },
        y: { label: null, domain: pooled.map((p) => p.entry) },
        marks: [
          Plot.dot(sites, { y: "entry", x: "percent", r: 3.5, stroke: "#5fa8d3", fill: "none", title: "site" }),
          Plot.ruleY(pooled, { y: "entry", x1: "lower", x2: "upper", stroke: INK, strokeWidth: 2 }),
          Plot.dot(pooled, { y: "entry", x: "percent", r: 6, fill: "#e69a28", stroke: INK }),
        ],
      })}
    />
  );
}

/** Cumulative emergence by day after sowing, one line and symbol per entry. */
export function EmergenceChart({ emergence, label, order }: { emergence: Pick<EmergenceAnalysis, "days"> & { curve: { day: number; percent: number; blindCode: string; varietyName?: string | null }[] }; label: EntryLabel; order: string[] }) {
  const data = emergence.curve.map((c) => ({ day: c.day, percent: c.percent, entry: label(c) }));
  const lastDay = emergence.days.at(-1);
  const summary = `Cumulative emergence by day after sowing (days ${emergence.days.join(", ")}). On day ${lastDay}: ${data
    .filter((d) => d.day === lastDay)
    .map((d) => `${d.entry} ${formatNumber(d.percent, 1)}%`)
    .join("; ")}.`;
  return (
    <Chart
      title="Emergence curves"
      summary={summary}
      testId="emergence-chart"
      height={320}
      build={() => ({
        x: { label: "Days after sowing", domain: [0, (lastDay ?? 14) + 1], grid: true },
        y: { label: "Emerged (%)", domain: [0, 100], grid: true },
        ...entryScales(order),
        marks: [
          Plot.line(data, { x: "day", y: "percent", stroke: "entry", strokeWidth: 2 }),
          Plot.dot(data, { x: "day", y: "percent", stroke: "entry", fill: "entry", symbol: "entry", r: 4 }),
        ],
      })}
    />
  );
}
