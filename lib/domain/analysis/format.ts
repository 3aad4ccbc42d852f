/** Number formatting shared by notes, tables and exports, so every place shows the same figures. */

/** A p-value as people read it: "p < 0.001" or "p = 0.034". */
export function formatP(p: number | null): string {
  if (p === null || !Number.isFinite(p)) return "p not available";
  return p < 0.001 ? "p < 0.001" : `p = ${p.toFixed(3)}`;
}

/** A value with a sensible number of decimals for its size. */
export function formatNumber(x: number | null | undefined, digits?: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  const d = digits ?? (Math.abs(x) >= 100 ? 0 : Math.abs(x) >= 10 ? 1 : 2);
  return x.toLocaleString("en-US", { minimumFractionDigits: d, maximumFractionDigits: d });
}

/** "4 of 6 sites", "1 site". */
export function countOf(n: number, total: number, noun: string): string {
  return `${n} of ${total} ${total === 1 ? noun : `${noun}s`}`;
}

/** What `valueWithUnit` needs to know about a trait. */
export interface UnitShape {
  unit: string | null;
  valueType: string;
  computation: string;
}

/**
 * A trait value as people write it: "6.9 on the 1-9 scale", "2,812 g per plot", "23.8 days", "40% yes".
 * Days are whole-day counts from sowing or transplanting, whatever the recorded unit ("date") says.
 */
export function valueWithUnit(trait: UnitShape, x: number | null | undefined, digits?: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  if (trait.computation !== "none" || trait.valueType === "date") return `${formatNumber(x, digits ?? 1)} days`;
  if (trait.valueType === "yes_no") return `${formatNumber(100 * x, digits ?? 0)}% yes`;
  if (trait.valueType === "rating") return trait.unit ? `${formatNumber(x, digits ?? 1)} on the ${trait.unit} scale` : formatNumber(x, digits ?? 1);
  return trait.unit ? `${formatNumber(x, digits)} ${trait.unit}` : formatNumber(x, digits);
}
