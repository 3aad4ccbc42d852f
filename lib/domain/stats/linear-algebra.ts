/**
 * Rank-revealing LDL' factorisation of the small symmetric positive semi-definite matrices left
 * after absorbing blocks (entries x entries). Columns are taken in order and a column whose pivot
 * vanishes is marked aliased, as R's lm marks the later of two collinear columns: its effect is
 * fixed at zero and it contributes no degree of freedom.
 */
export interface SymmetricFactor {
  size: number;
  /** unit lower-triangular factor, row-major size x size */
  lower: Float64Array;
  pivots: Float64Array;
  aliased: Uint8Array;
  rank: number;
}

/** Pivots below this fraction of the column's own diagonal are treated as exact zeros (rounding noise). */
const ALIAS_TOLERANCE = 1e-10;

export function factorSymmetric(matrix: Float64Array, size: number): SymmetricFactor {
  const lower = new Float64Array(size * size);
  const pivots = new Float64Array(size);
  const aliased = new Uint8Array(size);
  // w[k] = L[j][k] * d[k] for the current row j, reused across the rows below it
  const scaled = new Float64Array(size);
  let rank = 0;
  for (let j = 0; j < size; j++) {
    const rowJ = j * size;
    let pivot = matrix[rowJ + j];
    for (let k = 0; k < j; k++) {
      scaled[k] = lower[rowJ + k] * pivots[k];
      pivot -= lower[rowJ + k] * scaled[k];
    }
    lower[rowJ + j] = 1;
    if (!(matrix[rowJ + j] > 0) || pivot <= ALIAS_TOLERANCE * matrix[rowJ + j]) {
      aliased[j] = 1;
      pivots[j] = 0;
      continue; // column j of L stays zero below the diagonal
    }
    pivots[j] = pivot;
    rank++;
    for (let i = j + 1; i < size; i++) {
      const rowI = i * size;
      let value = matrix[rowI + j];
      for (let k = 0; k < j; k++) value -= lower[rowI + k] * scaled[k];
      lower[rowI + j] = value / pivot;
    }
  }
  return { size, lower, pivots, aliased, rank };
}

/** One solution of A x = b (aliased components set to zero); valid when b lies in A's column space. */
export function solveFactored(factor: SymmetricFactor, rhs: ArrayLike<number>): Float64Array {
  const { size, lower, pivots, aliased } = factor;
  const x = new Float64Array(size);
  for (let i = 0; i < size; i++) {
    let value = rhs[i];
    const row = i * size;
    for (let k = 0; k < i; k++) value -= lower[row + k] * x[k];
    x[i] = value;
  }
  for (let i = 0; i < size; i++) x[i] = aliased[i] ? 0 : x[i] / pivots[i];
  for (let i = size - 1; i >= 0; i--) {
    if (aliased[i]) {
      x[i] = 0;
      continue;
    }
    let value = x[i];
    for (let k = i + 1; k < size; k++) value -= lower[k * size + i] * x[k];
    x[i] = value;
  }
  return x;
}

/** A generalized inverse G (A G A = A) built from the factor; row-major size x size. */
export function generalizedInverse(factor: SymmetricFactor): Float64Array {
  const { size } = factor;
  const inverse = new Float64Array(size * size);
  const unit = new Float64Array(size);
  for (let j = 0; j < size; j++) {
    unit.fill(0);
    unit[j] = 1;
    const column = solveFactored(factor, unit);
    for (let i = 0; i < size; i++) inverse[i * size + j] = column[i];
  }
  return inverse;
}
