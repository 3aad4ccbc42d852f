/**
 * Singular value decomposition of the small dense tables the stability analysis needs (entries x
 * environments, tens by tens), by one-sided Jacobi rotations (Hestenes 1958; Demmel & Veselić 1992):
 * it reaches full relative accuracy in every singular value, small ones included, with no library.
 */

export interface Svd {
  /** singular values, largest first; min(rows, columns) of them */
  d: number[];
  /** left singular vectors as columns: u[k][i] is row i of the k-th vector */
  u: number[][];
  /** right singular vectors: v[k][j] is column j of the k-th vector */
  v: number[][];
}

const MAX_SWEEPS = 80;
const EPS = 2.220446049250313e-16;

/** A = U diag(d) V' for a rows x columns table given as rows. */
export function svd(rows: number[][]): Svd {
  const m = rows.length;
  const n = rows[0]?.length ?? 0;
  if (m < n) {
    // A' = V diag(d) U': decompose the transpose and swap the roles of the vectors
    const transposed = Array.from({ length: n }, (_, j) => rows.map((r) => r[j]!));
    const t = svd(transposed);
    return { d: t.d, u: t.v, v: t.u };
  }
  // columns of the working copy rotate towards mutually orthogonal columns A V
  const cols = Array.from({ length: n }, (_, j) => Float64Array.from(rows, (r) => r[j]!));
  const vcols = Array.from({ length: n }, (_, j) => Float64Array.from({ length: n }, (_, k) => (k === j ? 1 : 0)));
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let i = 0; i < n - 1; i++) {
      for (let j = i + 1; j < n; j++) {
        const a = cols[i]!;
        const b = cols[j]!;
        let alpha = 0;
        let beta = 0;
        let gamma = 0;
        for (let r = 0; r < m; r++) {
          alpha += a[r]! * a[r]!;
          beta += b[r]! * b[r]!;
          gamma += a[r]! * b[r]!;
        }
        if (gamma === 0 || Math.abs(gamma) <= EPS * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let r = 0; r < m; r++) {
          const x = a[r]!;
          const y = b[r]!;
          a[r] = c * x - s * y;
          b[r] = s * x + c * y;
        }
        const va = vcols[i]!;
        const vb = vcols[j]!;
        for (let r = 0; r < n; r++) {
          const x = va[r]!;
          const y = vb[r]!;
          va[r] = c * x - s * y;
          vb[r] = s * x + c * y;
        }
      }
    }
    if (!rotated) break;
  }
  const parts = cols.map((col, k) => {
    let norm = 0;
    for (const x of col) norm += x * x;
    norm = Math.sqrt(norm);
    return { d: norm, u: Array.from(col, (x) => (norm > 0 ? x / norm : 0)), v: Array.from(vcols[k]!) };
  });
  parts.sort((x, y) => y.d - x.d);
  return { d: parts.map((p) => p.d), u: parts.map((p) => p.u), v: parts.map((p) => p.v) };
}
