"use client";
import * as Plot from "@observablehq/plot";
import type { ColumnDef } from "@tanstack/react-table";
import type { BlindStability, CombinedAnalysis } from "@/lib/domain/analysis/types";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import { DataTable } from "@/components/ui/data-table";
import { Chart } from "./chart";
import { ENTRY_COLOURS, ENTRY_SYMBOLS } from "./palette";
import type { EntryLabel } from "./analysis-tables";

type StabilityView = NonNullable<CombinedAnalysis["stability"]> | BlindStability;
type Row = StabilityView["rows"][number] & { shown: string; varietyName?: string | null; isCheck?: boolean };

const INK = "#1b2618";
const SITE_COLOUR = "#8a2d5c";
const percent = (share: number) => `${formatNumber(100 * share, 0)}%`;

/** Each variety's response to the sites in numbers and words, and the GGE biplot with its text alternative. */
export function StabilityPanel({ stability, problem, label, order, shown }: { stability: StabilityView | null; problem: string | null; label: EntryLabel; order: string[]; shown: (x: number) => number }) {
  if (!stability) {
    return (
      <section aria-labelledby="stability-h" className="mt-6 space-y-2" data-testid="stability">
        <h3 id="stability-h" className="font-bold">Stability: how each entry responds to the sites</h3>
        <p className="text-sm">{problem ?? "Stability is not available for this trait."}</p>
      </section>
    );
  }
  const rows: Row[] = stability.rows.map((r) => ({ ...r, shown: label(r) }));
  const columns: ColumnDef<Row, unknown>[] = [
    { id: "entry", header: "Entry", accessorFn: (r) => r.shown },
    { id: "mean", header: "Mean of site means", accessorFn: (r) => shown(r.mean), cell: (c) => formatNumber(c.getValue() as number) },
    {
      id: "slope",
      header: "Slope on site mean (1 = average)",
      accessorFn: (r) => r.slope,
      cell: (c) => (
        <span>
          {formatNumber(c.row.original.slope, 2)} <span className="text-loam-700">± {formatNumber(c.row.original.slopeSe, 2)}</span>
        </span>
      ),
    },
    { id: "deviation", header: "Scatter about the line (mean square)", accessorFn: (r) => r.deviationMs, cell: (c) => `${formatNumber(c.getValue() as number)}${c.row.original.deviationP !== null ? ` (${formatP(c.row.original.deviationP)})` : ""}` },
    { id: "shukla", header: "Shukla's variance", accessorFn: (r) => r.shuklaVariance, cell: (c) => formatNumber(c.getValue() as number) },
    { id: "reading", header: "What it means", accessorFn: (r) => r.reading, enableSorting: false },
  ];
  return (
    <section aria-labelledby="stability-h" className="mt-6 space-y-3" data-testid="stability">
      <h3 id="stability-h" className="font-bold">Stability: how each entry responds to {stability.sites} sites</h3>
      <ul className="list-disc space-y-1 pl-5 text-sm" data-testid="stability-notes">
        {stability.notes.map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
      <DataTable pageSize={null} data={rows} columns={columns} caption="Response of each entry to the site mean" filterLabel="Filter entries" initialSort={[{ id: "slope", desc: true }]} testId="stability-table" />
      <GgeBiplot gge={stability.gge} label={label} order={order} />
    </section>
  );
}

/** Varieties as points and sites as arrows on the first two components of the variety and variety x site table. */
function GgeBiplot({ gge, label, order }: { gge: StabilityView["gge"]; label: EntryLabel; order: string[] }) {
  const entries = gge.entries.map((g) => ({ entry: label(g), pc1: g.pc1, pc2: g.pc2 }));
  const sites = gge.sites.map((g) => ({ site: g.siteName, short: g.siteName.length > 18 ? `${g.siteName.slice(0, 17)}…` : g.siteName, pc1: g.pc1, pc2: g.pc2 }));
  const axis1 = `Component 1 (${percent(gge.explained[0])} of the differences)`;
  const axis2 = `Component 2 (${percent(gge.explained[1])})`;
  const byPc1 = [...entries].sort((a, b) => b.pc1 - a.pc1);
  // which variety lies furthest in each site's direction: the best there as the two components see it
  const bestAt = sites.map((s) => ({ site: s.site, entry: [...entries].sort((a, b) => b.pc1 * s.pc1 + b.pc2 * s.pc2 - (a.pc1 * s.pc1 + a.pc2 * s.pc2))[0]?.entry ?? "–" }));
  const summary =
    `GGE biplot of the entry means at each site with the site means taken out. The first two components explain ${percent(gge.explained[0])} and ${percent(gge.explained[1])} ` +
    `(${percent(gge.explained[0] + gge.explained[1])} together) of how entries differ and change places between sites. Entries further right tended to score higher on average: ` +
    `${byPc1.map((e) => e.entry).join(", ")} from right to left. Sites are arrows from the centre; an entry far along a site's arrow tended to score high there ` +
    `(${bestAt.map((b) => `${b.site}: ${b.entry}`).join("; ")}). Sites whose arrows point the same way ranked entries alike.`;
  return (
    <Chart
      title="GGE biplot: entries and sites"
      summary={summary}
      testId="gge-biplot"
      height={380}
      build={(width) => ({
        marginLeft: 56,
        marginBottom: 44,
        marginRight: width < 500 ? 60 : 110,
        x: { label: axis1, labelAnchor: "center", labelOffset: 38, grid: true, nice: true },
        y: { label: axis2, grid: true, nice: true },
        color: { type: "ordinal", domain: order, range: [...ENTRY_COLOURS], legend: true },
        symbol: { type: "ordinal", domain: order, range: [...ENTRY_SYMBOLS] },
        marks: [
          Plot.ruleX([0], { stroke: "#bbbbbb" }),
          Plot.ruleY([0], { stroke: "#bbbbbb" }),
          Plot.arrow(sites, { x1: 0, y1: 0, x2: "pc1", y2: "pc2", stroke: SITE_COLOUR, strokeWidth: 1.5, headLength: 8 }),
          Plot.text(sites, { x: "pc1", y: "pc2", text: "short", fill: SITE_COLOUR, dx: 6, dy: -8, textAnchor: "start", fontWeight: 600 }),
          Plot.dot(entries, { x: "pc1", y: "pc2", stroke: "entry", fill: "entry", symbol: "entry", r: 5 }),
          Plot.text(entries, { x: "pc1", y: "pc2", text: "entry", dx: 8, textAnchor: "start", fill: INK }),
        ],
      })}
    >
      <details>
        <summary className="min-h-11 cursor-pointer py-2 text-sm font-semibold">Biplot numbers</summary>
        <table className="text-sm">
          <caption className="sr-only">Scores of entries and sites on the first two components</caption>
          <thead>
            <tr>
              <th scope="col" className="pr-4 text-left">Entry or site</th>
              <th scope="col" className="pr-4 text-right">Component 1</th>
              <th scope="col" className="text-right">Component 2</th>
            </tr>
          </thead>
          <tbody>
            {entries.map((e) => (
              <tr key={`e-${e.entry}`}>
                <th scope="row" className="pr-4 text-left font-normal">{e.entry}</th>
                <td className="pr-4 text-right">{formatNumber(e.pc1, 2)}</td>
                <td className="text-right">{formatNumber(e.pc2, 2)}</td>
              </tr>
            ))}
            {sites.map((s) => (
              <tr key={`s-${s.site}`}>
                <th scope="row" className="pr-4 text-left font-normal">Site: {s.site}</th>
                <td className="pr-4 text-right">{formatNumber(s.pc1, 2)}</td>
                <td className="text-right">{formatNumber(s.pc2, 2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </details>
    </Chart>
  );
}
