"use client";
import type { ColumnDef } from "@tanstack/react-table";
import type { MixedAnalysis } from "@/lib/domain/analysis/mixed";
import { differenceWithUnit, formatNumber, formatP, inShownUnit, type UnitShape } from "@/lib/domain/analysis/format";
import { DataTable } from "@/components/ui/data-table";
import { MeansTable, type EntryLabel } from "./analysis-tables";

const TERM_LABELS: Record<string, (env: string) => string> = {
  environment: (env) => `Between ${env}s`,
  "entry:environment": (env) => `Variety × ${env}`,
  "block:environment": (env) => `Blocks within a ${env}`,
  residual: () => "Plot to plot",
};

type ComponentRow = MixedAnalysis["components"][number] & { label: string };
type PairRow = MixedAnalysis["pairs"][number] & { aShown: string; bShown: string };

/**
 * The REML mixed model: what it found in words, the variance components, means with SE and letters,
 * and every pairwise test. Values in the trait's shown unit (a yes/no share as % yes).
 */
export function MixedModelSection({
  mixed,
  trait,
  label,
  unit,
  order,
  testId,
}: {
  mixed: MixedAnalysis;
  trait: UnitShape;
  label: EntryLabel;
  unit: string;
  order: string;
  testId?: string;
}) {
  const shown = (x: number) => inShownUnit(trait, x);
  const env = mixed.environmentWord;
  const components: ComponentRow[] = mixed.components.map((c) => ({ ...c, label: TERM_LABELS[c.term](env) }));
  const componentColumns: ColumnDef<ComponentRow, unknown>[] = [
    { id: "source", header: "Source", accessorFn: (c) => c.label },
    { id: "sd", header: `Spread (SD, ${unit})`, accessorFn: (c) => Math.sqrt(Math.max(c.variance, 0)), cell: (c) => differenceWithUnit(trait, c.getValue() as number) },
    { id: "share", header: "% of the variation", accessorFn: (c) => c.share, cell: (c) => `${formatNumber(c.getValue() as number, 0)}%` },
    { id: "variance", header: "Variance", accessorFn: (c) => c.variance, cell: (c) => formatNumber(c.getValue() as number, 3) },
    { id: "words", header: "What it means", accessorFn: (c) => c.words },
  ];
  const pairs: PairRow[] = mixed.pairs.map((p) => {
    const a = mixed.means.find((m) => m.key === p.a)!;
    const b = mixed.means.find((m) => m.key === p.b)!;
    return { ...p, aShown: label(a), bShown: label(b) };
  });
  const pairColumns: ColumnDef<PairRow, unknown>[] = [
    { id: "pair", header: "Pair", accessorFn: (p) => `${p.aShown} − ${p.bShown}` },
    { id: "diff", header: `Difference (${unit})`, accessorFn: (p) => shown(p.diff), cell: (c) => formatNumber(c.getValue() as number) },
    { id: "se", header: "± SE", accessorFn: (p) => shown(p.se), cell: (c) => formatNumber(c.getValue() as number) },
    { id: "df", header: "df", accessorFn: (p) => p.df, cell: (c) => formatNumber(c.getValue() as number, 1) },
    { id: "t", header: "t", accessorFn: (p) => p.t, cell: (c) => formatNumber(c.getValue() as number, 2) },
    { id: "p", header: "p", accessorFn: (p) => p.p, cell: (c) => formatP(c.getValue() as number) },
  ];
  const means = mixed.means.map((m) => ({ ...m, mean: shown(m.mean), se: shown(m.se), checkDifference: m.checkDifference === null ? null : shown(m.checkDifference), beyondLsd: null }));
  const dfs = mixed.means.map((m) => m.df);
  return (
    <div className="space-y-4" data-testid={testId}>
      <ul className="list-disc space-y-1 pl-5">
        {mixed.notes.map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
      <DataTable pageSize={null} data={components} columns={componentColumns} caption={`How the variation splits (REML estimates over ${mixed.environments.length} ${env}s)`} />
      <MeansTable means={means} label={label} unit={unit} order={order} caption="Variety means from the mixed model" lsdMarks={false} />
      <p className="text-sm">
        Varieties: F = {formatNumber(mixed.entryTest.f, 2)} on {mixed.entryTest.numDf} and {formatNumber(mixed.entryTest.denDf, 1)} df, {formatP(mixed.entryTest.p)} ·
        SE of the means from the mixed model (df {mixed.dfMethod === "satterthwaite" ? "by Satterthwaite" : "by Kenward-Roger"}: {formatNumber(Math.min(...dfs), 1)} to {formatNumber(Math.max(...dfs), 1)}) · letters from
        pairwise t tests at 0.05, given only when the F test is significant.
      </p>
      <details>
        <summary className="min-h-11 cursor-pointer py-2 font-semibold">Every pair of varieties ({pairs.length})</summary>
        <DataTable data={pairs} columns={pairColumns} caption="Pairwise differences (first minus second)" filterLabel="Filter pairs" />
      </details>
    </div>
  );
}
