import { inStatedOrder } from "@/lib/domain/analysis/ranking";
import { G, Line, Rect, Svg, Text as SvgText } from "@react-pdf/renderer";
import type { PublicMean } from "@/lib/domain/publish/public-shape";
import { differenceWithUnit, inShownUnit, unitHeading, type UnitShape } from "@/lib/domain/analysis/format";

// SVG text does not inherit the page's fonts; without a family it falls back to a Helvetica that is not embedded.
const CHART_FONT = ["Inter", "Inter Greek"];

// Horizontal bars with ±1 SE whiskers, drawn as vector shapes in greys and black so the chart reads
// the same when printed in black and white. The check variety gets a hatched-looking darker bar.
export function MeansChart({ means, width = 480, trait, lsd }: { means: PublicMean[]; width?: number; trait: UnitShape; lsd: number | null }) {
  const rows = inStatedOrder(means);
  const unit = unitHeading(trait);
  // values in the unit the axis is labelled with (a yes/no share as % yes)
  const shown = (x: number) => inShownUnit(trait, x);
  const rowHeight = 16;
  const labelWidth = 120;
  const top = 6;
  const height = top + rows.length * rowHeight + 28;
  const values = rows.map((m) => shown((m.lsMean ?? m.mean) + m.se));
  const maxValue = Math.max(...values, 0) * 1.08 || 1;
  const plotWidth = width - labelWidth - 12;
  const x = (v: number) => labelWidth + (Math.max(0, v) / maxValue) * plotWidth;
  const ticks = niceTicks(maxValue);
  return (
    <Svg width={width} height={height} viewBox={`0 0 ${width} ${height}`}>
      {ticks.map((t) => (
        <G key={`t${t}`}>
          <Line x1={x(t)} y1={top} x2={x(t)} y2={top + rows.length * rowHeight} stroke="#c9c9c9" strokeWidth={0.5} />
          <SvgText x={x(t)} y={top + rows.length * rowHeight + 10} style={{ fontSize: 6.5, fontFamily: CHART_FONT }} textAnchor="middle" fill="#333333">
            {formatTick(t)}
          </SvgText>
        </G>
      ))}
      {rows.map((m, i) => {
        const value = shown(m.lsMean ?? m.mean);
        const se = shown(m.se);
        const y = top + i * rowHeight;
        return (
          <G key={m.blindCode}>
            <SvgText x={labelWidth - 6} y={y + 10} style={{ fontSize: 7.5, fontFamily: CHART_FONT }} textAnchor="end" fill="#000000">
              {`${m.varietyName ?? m.blindCode}${m.isCheck ? " (check)" : ""}`}
            </SvgText>
            <Rect x={labelWidth} y={y + 3} width={Math.max(0.5, x(value) - labelWidth)} height={rowHeight - 6} fill={m.isCheck ? "#4d4d4d" : "#a6a6a6"} stroke="#000000" strokeWidth={0.4} />
            <Line x1={x(value - se)} y1={y + rowHeight / 2} x2={x(value + se)} y2={y + rowHeight / 2} stroke="#000000" strokeWidth={0.8} />
            <Line x1={x(value - se)} y1={y + 5} x2={x(value - se)} y2={y + rowHeight - 5} stroke="#000000" strokeWidth={0.8} />
            <Line x1={x(value + se)} y1={y + 5} x2={x(value + se)} y2={y + rowHeight - 5} stroke="#000000" strokeWidth={0.8} />
          </G>
        );
      })}
      <SvgText x={labelWidth + plotWidth / 2} y={height - 4} style={{ fontSize: 7, fontFamily: CHART_FONT }} textAnchor="middle" fill="#000000">
        {`Mean${unit ? ` (${unit})` : ""} ± 1 SE${lsd !== null ? `; LSD 0.05 = ${differenceWithUnit(trait, lsd)}` : ""}`}
      </SvgText>
    </Svg>
  );
}

function niceTicks(max: number): number[] {
  const rough = max / 4;
  const magnitude = 10 ** Math.floor(Math.log10(rough));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * magnitude).find((s) => s >= rough) ?? rough;
  const ticks: number[] = [];
  for (let t = 0; t <= max + 1e-9; t += step) ticks.push(Number(t.toPrecision(12)));
  return ticks;
}

function formatTick(v: number): string {
  return Math.abs(v) >= 100 ? v.toFixed(0) : Math.abs(v) >= 10 ? v.toFixed(1) : v.toFixed(2);
}
