/** Readers for the reference files copied into tests/fixtures (see the README in each folder). */
import { readFileSync } from "node:fs";
import path from "node:path";

export const FIXTURES = path.resolve(__dirname, "../../fixtures");

export function readJson<T = any>(relativePath: string): T {
  return JSON.parse(readFileSync(path.join(FIXTURES, relativePath), "utf8")) as T;
}

/** Rows of a simple CSV (no quoted fields) keyed by the header; empty cells become "". */
export function readCsv(relativePath: string): Record<string, string>[] {
  const lines = readFileSync(path.join(FIXTURES, relativePath), "utf8").trim().split(/\r?\n/);
  const header = lines[0].split(",");
  return lines.slice(1).map((line) => {
    const cells = line.split(",");
    return Object.fromEntries(header.map((name, i) => [name, cells[i] ?? ""]));
  });
}

/** Plot rows of an r-checks CSV: an empty value is a missing plot (null). */
export function readPlots(caseName: string) {
  return readCsv(`r-checks/${caseName}.csv`).map((row) => ({
    site: row.site,
    block: row.block,
    entry: row.entry,
    value: row.value === "" ? null : Number(row.value),
  }));
}

/** Log relative error, capped at 15 (NIST StRD scoring). */
export function lre(actual: number, certified: number): number {
  if (actual === certified) return 15;
  const value = -Math.log10(Math.abs(actual - certified) / Math.abs(certified));
  return Math.min(15, value);
}

export function relativeError(actual: number, expected: number): number {
  if (actual === expected) return 0;
  return Math.abs(actual - expected) / Math.abs(expected);
}
