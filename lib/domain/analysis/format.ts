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
