/**
 * Chi-square tests on counts: goodness of fit, independence / homogeneity of an r x c table, and
 * the Cochran-Mantel-Haenszel test across strata (sites). Defaults follow R's chisq.test and
 * mantelhaen.test (Yates' and the MH continuity corrections on 2 x 2 tables only).
 */
import { chiSquareUpper, normalQuantile } from "./distributions";
import { StatsError } from "./errors";
import { factorSymmetric, solveFactored } from "./linear-algebra";

function requireCount(value: unknown, where: string): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new StatsError("NON_FINITE_VALUE", `The count ${where} is not a finite number (got ${String(value)}).`, { where, value });
  }
  if (value < 0) {
    throw new StatsError("INVALID_COUNT", `The count ${where} is negative (${value}); counts must be zero or more.`, { where, value });
  }
  return value;
}

/**
 * Pearson chi-square goodness of fit of observed counts to expected counts or proportions
 * (expected values are rescaled to the observed total, so either form works). df = categories - 1.
 */
export function chiSquareGoodnessOfFit(observed: number[], expected: number[]): { statistic: number; df: number; p: number; expected: number[] } {
  if (!Array.isArray(observed) || !Array.isArray(expected) || observed.length !== expected.length) {
    throw new StatsError("TABLE_SHAPE", "Observed and expected need the same number of categories.");
  }
  if (observed.length < 2) {
    throw new StatsError("TOO_FEW_GROUPS", "A goodness-of-fit test needs at least two categories.");
  }
  const counts = observed.map((value, i) => requireCount(value, `in category ${i + 1}`));
  const weights = expected.map((value, i) => {
    if (typeof value !== "number" || !(value > 0) || !Number.isFinite(value)) {
      throw new StatsError("INVALID_PROBABILITY", `The expected value of category ${i + 1} must be a positive number (got ${value}).`, {
        index: i,
        value,
      });
    }
    return value;
  });
  const total = counts.reduce((sum, x) => sum + x, 0);
  if (!(total > 0)) throw new StatsError("EMPTY_TABLE_ROW", "All observed counts are zero; there is nothing to test.");
  const weightTotal = weights.reduce((sum, x) => sum + x, 0);
  const expectedCounts = weights.map((w) => (total * w) / weightTotal);
  let statistic = 0;
  for (let i = 0; i < counts.length; i++) {
    const deviation = counts[i] - expectedCounts[i];
    statistic += (deviation * deviation) / expectedCounts[i];
  }
  const df = counts.length - 1;
  return { statistic, df, p: chiSquareUpper(statistic, df), expected: expectedCounts };
}

function validateTable(table: number[][], what: string): number[][] {
  if (!Array.isArray(table) || table.length < 2 || !Array.isArray(table[0]) || table[0].length < 2) {
    throw new StatsError("TABLE_SHAPE", `The ${what} needs at least two rows and two columns.`);
  }
  const columns = table[0].length;
  return table.map((row, i) => {
    if (!Array.isArray(row) || row.length !== columns) {
      throw new StatsError("TABLE_SHAPE", `Row ${i + 1} of the ${what} has ${row?.length ?? 0} cells; every row needs ${columns}.`);
    }
    return row.map((value, j) => requireCount(value, `in row ${i + 1}, column ${j + 1} of the ${what}`));
  });
}

/**
 * Pearson chi-square test of independence (homogeneity) for an r x c table of counts, e.g.
 * entries x (emerged, not emerged). Yates' correction is applied to 2 x 2 tables unless
 * correct = false (as R). lowExpected = number of cells whose expected count is below 5.
 */
export function chiSquareIndependence(
  table: number[][],
  opts: { correct?: boolean } = {},
): { statistic: number; df: number; p: number; expected: number[][]; lowExpected: number; corrected: boolean } {
  const counts = validateTable(table, "table");
  const rows = counts.length;
  const columns = counts[0].length;
  const rowTotals = counts.map((row) => row.reduce((sum, x) => sum + x, 0));
  const columnTotals = Array.from({ length: columns }, (_, j) => counts.reduce((sum, row) => sum + row[j], 0));
  rowTotals.forEach((total, i) => {
    if (total === 0) throw new StatsError("EMPTY_TABLE_ROW", `Row ${i + 1} of the table is all zeros; remove it before testing.`, { row: i });
  });
  columnTotals.forEach((total, j) => {
    if (total === 0) {
      throw new StatsError("EMPTY_TABLE_COLUMN", `Column ${j + 1} of the table is all zeros; remove it before testing.`, { column: j });
    }
  });
  const total = rowTotals.reduce((sum, x) => sum + x, 0);
  const expected = rowTotals.map((r) => columnTotals.map((c) => (r * c) / total));
  let correction = 0;
  const corrected = (opts.correct ?? true) && rows === 2 && columns === 2;
  if (corrected) {
    let smallest = Infinity;
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) smallest = Math.min(smallest, Math.abs(counts[i][j] - expected[i][j]));
    correction = Math.min(0.5, smallest);
  }
  let statistic = 0;
  let lowExpected = 0;
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < columns; j++) {
      const deviation = Math.abs(counts[i][j] - expected[i][j]) - correction;
      statistic += (deviation * deviation) / expected[i][j];
      if (expected[i][j] < 5) lowExpected++;
    }
  }
  const df = (rows - 1) * (columns - 1);
  return { statistic, df, p: chiSquareUpper(statistic, df), expected, lowExpected, corrected: corrected && correction > 0 };
}

/**
 * Cochran-Mantel-Haenszel test that rows and columns are independent within every stratum
 * (strata[k] is the r x c table of site k). General r x c x K: the generalized statistic of
 * Landis, Heyman & Koch (1978), df = (r-1)(c-1). 2 x 2 x K: the Mantel-Haenszel statistic with
 * continuity correction unless correct = false, plus the MH common odds ratio with its 95%
 * interval (variance of Robins, Breslow & Greenland 1986).
 */
export function cochranMantelHaenszel(
  strata: number[][][],
  opts: { correct?: boolean } = {},
): { statistic: number; df: number; p: number; commonOddsRatio?: number; oddsRatioCi95?: [number, number] } {
  if (!Array.isArray(strata) || strata.length < 1) {
    throw new StatsError("TABLE_SHAPE", "The Cochran-Mantel-Haenszel test needs at least one stratum (site) table.");
  }
  const tables = strata.map((stratum, k) => validateTable(stratum, `table of stratum ${k + 1}`));
  const I = tables[0].length;
  const J = tables[0][0].length;
  tables.forEach((t, k) => {
    if (t.length !== I || t[0].length !== J) {
      throw new StatsError("TABLE_SHAPE", `Stratum ${k + 1} is ${t.length} x ${t[0].length}; every stratum must be ${I} x ${J}.`);
    }
    const total = t.reduce((sum, row) => sum + row.reduce((s, x) => s + x, 0), 0);
    if (total < 2) {
      throw new StatsError("EMPTY_TABLE_ROW", `Stratum ${k + 1} has fewer than two observations; drop it before testing.`, { stratum: k });
    }
  });

  if (I === 2 && J === 2) {
    let delta = 0;
    let variance = 0;
    let diagonal = 0;
    let offDiagonal = 0;
    let termDD = 0;
    let termDO = 0;
    let termOO = 0;
    for (const [[a, b], [c, d]] of tables) {
      const n = a + b + c + d;
      const row1 = a + b;
      const row2 = c + d;
      const column1 = a + c;
      const column2 = b + d;
      delta += a - (row1 * column1) / n;
      variance += (row1 * row2 * column1 * column2) / (n * n * (n - 1));
      diagonal += (a * d) / n;
      offDiagonal += (b * c) / n;
      termDD += ((a + d) * a * d) / (n * n);
      termDO += ((a + d) * b * c + (b + c) * a * d) / (n * n);
      termOO += ((b + c) * b * c) / (n * n);
    }
    const continuity = (opts.correct ?? true) && Math.abs(delta) >= 0.5 ? 0.5 : 0;
    const statistic = (Math.abs(delta) - continuity) ** 2 / variance;
    const oddsRatio = diagonal / offDiagonal;
    const logSd = Math.sqrt(
      termDD / (2 * diagonal * diagonal) + termDO / (2 * diagonal * offDiagonal) + termOO / (2 * offDiagonal * offDiagonal),
    );
    const z = normalQuantile(0.975);
    return {
      statistic,
      df: 1,
      p: chiSquareUpper(statistic, 1),
      commonOddsRatio: oddsRatio,
      oddsRatioCi95: [oddsRatio * Math.exp(-z * logSd), oddsRatio * Math.exp(z * logSd)],
    };
  }

  // cells (i, j), i < I-1, j < J-1, indexed j * (I-1) + i
  const R = I - 1;
  const C = J - 1;
  const size = R * C;
  const difference = new Float64Array(size);
  const covariance = new Float64Array(size * size);
  for (const table of tables) {
    const rowTotals = table.map((row) => row.reduce((sum, x) => sum + x, 0));
    const columnTotals = Array.from({ length: J }, (_, j) => table.reduce((sum, row) => sum + row[j], 0));
    const n = rowTotals.reduce((sum, x) => sum + x, 0);
    const scale = 1 / (n * n * (n - 1));
    for (let j = 0; j < C; j++) {
      for (let i = 0; i < R; i++) {
        const cell = j * R + i;
        difference[cell] += table[i][j] - (rowTotals[i] * columnTotals[j]) / n;
        for (let j2 = 0; j2 < C; j2++) {
          const columnPart = (j === j2 ? n * columnTotals[j] : 0) - columnTotals[j] * columnTotals[j2];
          for (let i2 = 0; i2 < R; i2++) {
            const rowPart = (i === i2 ? n * rowTotals[i] : 0) - rowTotals[i] * rowTotals[i2];
            covariance[cell * size + j2 * R + i2] += columnPart * rowPart * scale;
          }
        }
      }
    }
  }
  const factor = factorSymmetric(covariance, size);
  if (factor.rank < size) {
    throw new StatsError(
      "NOT_ESTIMABLE",
      "The stratified table is degenerate (a row or column is empty in every stratum), so the Cochran-Mantel-Haenszel test cannot be computed.",
    );
  }
  const solution = solveFactored(factor, difference);
  let statistic = 0;
  for (let x = 0; x < size; x++) statistic += difference[x] * solution[x];
  const df = size;
  return { statistic, df, p: chiSquareUpper(statistic, df) };
}
