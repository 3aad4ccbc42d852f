/**
 * REML mixed model for multi-environment variety trials:
 *   value ~ entry + (1 | environment) + (1 | environment:block) + (1 | environment:entry)
 * Entries are fixed; environments (a site, or a site-year), blocks within environments and the entry x
 * environment interaction are random. The fit follows lme4 (profiled REML criterion over the ratios
 * of the random-effect standard deviations to the residual one), the denominator df follow lmerTest
 * (Satterthwaite, observed information) or pbkrtest (Kenward-Roger, expected information and the
 * adjusted covariance of the fixed effects).
 *
 * V is block diagonal by environment, and within an environment it is
 *   residual I + interaction (same entry) + block (same block) + environment (all plots),
 * so every quantity is built from per-environment sums: the cells (entry x environment) are small
 * compound-symmetric blocks inverted in closed form, and blocks and the environment are added back
 * by a (1 + blocks)-sized Woodbury update. The cost of one evaluation grows with entries^2 per
 * environment, not with plots^3.
 */
import { fUpper, studentTTwoSided } from "./distributions";
import { StatsError } from "./errors";

export interface MixedPlot {
  site: string;
  year?: string;
  block: string;
  entry: string;
  value: number;
}

export type MixedTerm = "environment" | "block:environment" | "entry:environment" | "residual";

export interface MixedModelResult {
  components: { term: MixedTerm; variance: number }[];
  /** -2 x restricted log-likelihood, as lme4's REMLcrit */
  remlCriterion: number;
  /** a variance estimated at zero (lme4's isSingular: a standard-deviation ratio below 1e-4) */
  singular: boolean;
  n: number;
  entryTest: { numDf: number; denDf: number; f: number; p: number };
  entryMeans: { entry: string; mean: number; se: number; df: number }[];
  pairs: { a: string; b: string; diff: number; se: number; df: number; t: number; p: number }[];
  /** environments in order of first appearance ("site" or "site year") */
  environments: string[];
  dfMethod: "satterthwaite" | "kenward-roger";
}

export interface MixedModelOptions {
  df?: "satterthwaite" | "kenward-roger";
  /**
   * Entries in their order (the first is the reference level of the entry F test's contrasts, as R's
   * factor levels); each must have plots, so a variety without data is an error, not silently dropped.
   */
  entries?: readonly string[];
}

const RANDOM_TERMS: MixedTerm[] = ["environment", "block:environment", "entry:environment"];
/** lme4's isSingular tolerance on the relative standard deviations */
const SINGULAR_TOLERANCE = 1e-4;

interface Cell {
  entry: number;
  count: number;
  sum: number;
  /** plots of this cell in each block of its environment */
  blockCounts: Float64Array;
}

interface Environment {
  name: string;
  cells: Cell[];
  blockCount: number;
  blockPlots: Float64Array;
  blockSums: Float64Array;
  sumSquares: number;
  /** plots in order, for the dense Kenward-Roger path */
  plots: { block: number; cell: number; value: number }[];
}

interface Design {
  entries: string[];
  environments: Environment[];
  n: number;
  p: number;
  counts: Float64Array;
  scratch: { weight: Float64Array; g: Float64Array; uy: Float64Array; ux: Float64Array; scale: Float64Array; m: Float64Array; y: Float64Array };
}

interface Evaluation {
  logDetV: number;
  /** X' V^-1 X, p x p row-major */
  xvx: Float64Array;
  xvy: Float64Array;
  yvy: number;
}

function buildDesign(data: readonly MixedPlot[], opts: MixedModelOptions): Design {
  if (!Array.isArray(data)) {
    throw new StatsError("INVALID_ARGUMENT", "The mixed model needs a list of plots.");
  }
  const withYear = data.some((plot) => plot.year !== undefined && plot.year !== "");
  const entryIndex = new Map<string, number>();
  const entries: string[] = [];
  // the first entry is R's reference level, which fixes lmerTest's F-test contrasts
  for (const expected of opts.entries ?? []) {
    if (!entryIndex.has(expected)) {
      entryIndex.set(expected, entries.length);
      entries.push(expected);
    }
  }
  const envIndex = new Map<string, number>();
  const raw: { name: string; blocks: Map<string, number>; plots: { block: number; entry: number; value: number }[] }[] = [];
  data.forEach((plot, row) => {
    if (typeof plot.value !== "number" || !Number.isFinite(plot.value)) {
      throw new StatsError(
        "NON_FINITE_VALUE",
        `Plot ${row + 1} (${plot.entry} at ${plot.site}${plot.year ? ` ${plot.year}` : ""}, block ${plot.block}) has no usable number (${String(plot.value)}); leave a missing plot out instead.`,
        { row, value: plot.value },
      );
    }
    const envName = withYear ? `${plot.site} ${plot.year ?? ""}` : plot.site;
    let env = envIndex.get(envName);
    if (env === undefined) {
      env = raw.length;
      envIndex.set(envName, env);
      raw.push({ name: envName, blocks: new Map(), plots: [] });
    }
    let entry = entryIndex.get(plot.entry);
    if (entry === undefined) {
      entry = entries.length;
      entryIndex.set(plot.entry, entry);
      entries.push(plot.entry);
    }
    const blocks = raw[env].blocks;
    let block = blocks.get(plot.block);
    if (block === undefined) {
      block = blocks.size;
      blocks.set(plot.block, block);
    }
    raw[env].plots.push({ block, entry, value: plot.value });
  });
  for (const expected of opts.entries ?? []) {
    if (!data.some((plot) => plot.entry === expected)) {
      throw new StatsError("EMPTY_ENTRY", `${expected} has no plots with a value, so it cannot be compared.`, {
        entry: expected,
      });
    }
  }
  if (raw.length < 2) {
    throw new StatsError(
      "TOO_FEW_GROUPS",
      `A mixed model across ${withYear ? "site-years" : "sites"} needs at least two of them (found ${raw.length}).`,
      { environments: raw.map((env) => env.name) },
    );
  }
  if (entries.length < 2) {
    throw new StatsError("TOO_FEW_ENTRIES", `Comparing varieties needs at least two (found ${entries.length}).`);
  }
  const p = entries.length;
  const counts = new Float64Array(p);
  const environments = raw.map((env): Environment => {
    const blockCount = env.blocks.size;
    const cellOf = new Map<number, number>();
    const cells: Cell[] = [];
    const blockPlots = new Float64Array(blockCount);
    const blockSums = new Float64Array(blockCount);
    let sumSquares = 0;
    const plots: Environment["plots"] = [];
    for (const plot of env.plots) {
      let c = cellOf.get(plot.entry);
      if (c === undefined) {
        c = cells.length;
        cellOf.set(plot.entry, c);
        cells.push({ entry: plot.entry, count: 0, sum: 0, blockCounts: new Float64Array(blockCount) });
      }
      const cell = cells[c];
      cell.count++;
      cell.sum += plot.value;
      cell.blockCounts[plot.block]++;
      blockPlots[plot.block]++;
      blockSums[plot.block] += plot.value;
      sumSquares += plot.value * plot.value;
      counts[plot.entry]++;
      plots.push({ block: plot.block, cell: c, value: plot.value });
    }
    return { name: env.name, cells, blockCount, blockPlots, blockSums, sumSquares, plots };
  });
  const n = data.length;
  if (n <= p + 1) {
    throw new StatsError(
      "NO_RESIDUAL_DF",
      `There are too few plots (${n}) for ${p} varieties to estimate how much plots vary.`,
    );
  }
  const maxCells = Math.max(...environments.map((env) => env.cells.length));
  const maxU = 1 + Math.max(...environments.map((env) => env.blockCount));
  const scratch = {
    weight: new Float64Array(maxCells),
    g: new Float64Array(maxU * maxU),
    uy: new Float64Array(maxU),
    ux: new Float64Array(maxU * maxCells),
    scale: new Float64Array(maxU),
    m: new Float64Array(maxU * maxU),
    y: new Float64Array((maxCells + 1) * maxU),
  };
  return { entries, environments, n, p, counts, scratch };
}

/** Lower Cholesky factor in place (row-major); false when not positive definite. */
function cholesky(a: Float64Array, size: number): boolean {
  for (let j = 0; j < size; j++) {
    let d = a[j * size + j];
    for (let k = 0; k < j; k++) d -= a[j * size + k] * a[j * size + k];
    if (!(d > 0)) return false;
    const root = Math.sqrt(d);
    a[j * size + j] = root;
    for (let i = j + 1; i < size; i++) {
      let v = a[i * size + j];
      for (let k = 0; k < j; k++) v -= a[i * size + k] * a[j * size + k];
      a[i * size + j] = v / root;
    }
    for (let k = j + 1; k < size; k++) a[j * size + k] = 0;
  }
  return true;
}

function logDetFromCholesky(l: Float64Array, size: number): number {
  let s = 0;
  for (let i = 0; i < size; i++) s += Math.log(l[i * size + i]);
  return 2 * s;
}

/** Inverse of a symmetric positive-definite matrix from its Cholesky factor. */
function inverseFromCholesky(l: Float64Array, size: number): Float64Array {
  const inv = new Float64Array(size * size);
  const column = new Float64Array(size);
  for (let c = 0; c < size; c++) {
    column.fill(0);
    column[c] = 1;
    for (let i = 0; i < size; i++) {
      let v = column[i];
      for (let k = 0; k < i; k++) v -= l[i * size + k] * column[k];
      column[i] = v / l[i * size + i];
    }
    for (let i = size - 1; i >= 0; i--) {
      let v = column[i];
      for (let k = i + 1; k < size; k++) v -= l[k * size + i] * column[k];
      column[i] = v / l[i * size + i];
    }
    for (let i = 0; i < size; i++) inv[i * size + c] = column[i];
  }
  return inv;
}

function inverseSpd(a: Float64Array, size: number): Float64Array | null {
  const l = Float64Array.from(a);
  if (!cholesky(l, size)) return null;
  return inverseFromCholesky(l, size);
}

/**
 * X'V^-1 X, X'V^-1 y, y'V^-1 y and log|V| for variances [environment, block, interaction, residual],
 * with X the entry indicators (one column per entry: the cell-means parameterisation).
 */

function evaluate(design: Design, variances: readonly number[]): Evaluation {
  const [sEnv, sBlock, sCell, sRes] = variances;
  const p = design.p;
  const xvx = new Float64Array(p * p);
  const xvy = new Float64Array(p);
  let yvy = 0;
  let logDetV = 0;
  const rootEnv = Math.sqrt(Math.max(sEnv, 0));
  const rootBlock = Math.sqrt(Math.max(sBlock, 0));
  // scratch reused across environments (an evaluation runs hundreds of times per fit)
  const scratch = design.scratch;
  for (const env of design.environments) {
    const cells = env.cells;
    const nc = cells.length;
    const u = 1 + env.blockCount;
    const weight = scratch.weight;
    let cellQuad = 0;
    for (let c = 0; c < nc; c++) {
      const d = sRes + cells[c].count * sCell;
      weight[c] = 1 / d;
      logDetV += (cells[c].count - 1) * Math.log(sRes) + Math.log(d);
      cellQuad += cells[c].sum * cells[c].sum * weight[c];
    }
    // U'W0^-1 U with U = [1, block indicators], W0 = residual I + interaction (cells)
    const g = scratch.g.fill(0, 0, u * u);
    const uy = scratch.uy.fill(0, 0, u);
    const ux = scratch.ux.fill(0, 0, u * nc);
    for (let c = 0; c < nc; c++) {
      const cell = cells[c];
      const w = weight[c];
      g[0] += cell.count * w;
      uy[0] += cell.sum * w;
      ux[c] = cell.count * w;
      for (let k = 0; k < env.blockCount; k++) {
        const nk = cell.blockCounts[k];
        if (nk === 0) continue;
        g[k + 1] += nk * w;
        ux[(k + 1) * nc + c] = nk * w;
        uy[k + 1] -= (sCell / sRes) * nk * cell.sum * w;
        for (let l = 0; l < env.blockCount; l++) {
          const nl = cell.blockCounts[l];
          if (nl !== 0) g[(k + 1) * u + l + 1] -= (sCell / sRes) * nk * nl * w;
        }
      }
    }
    for (let k = 0; k < env.blockCount; k++) {
      g[(k + 1) * u] = g[k + 1];
      g[(k + 1) * u + k + 1] += env.blockPlots[k] / sRes;
      uy[k + 1] += env.blockSums[k] / sRes;
    }
    // M = I + D^1/2 G D^1/2
    const scale = scratch.scale;
    scale[0] = rootEnv;
    for (let k = 1; k < u; k++) scale[k] = rootBlock;
    const m = scratch.m;
    for (let i = 0; i < u; i++) {
      for (let j = 0; j < u; j++) m[i * u + j] = scale[i] * g[i * u + j] * scale[j];
      m[i * u + i] += 1;
    }
    if (!cholesky(m, u)) throw new StatsError("NOT_ESTIMABLE", "The mixed model could not be fitted (variances out of range).");
    logDetV += logDetFromCholesky(m, u);
    // Y = L^-1 D^1/2 [U'W0^-1 X | U'W0^-1 y], stored one column (cell, then y) after another
    const cols = nc + 1;
    const y = scratch.y;
    for (let c = 0; c < cols; c++) {
      const base = c * u;
      for (let i = 0; i < u; i++) {
        let v = scale[i] * (c < nc ? ux[i * nc + c] : uy[i]);
        for (let k = 0; k < i; k++) v -= m[i * u + k] * y[base + k];
        y[base + i] = v / m[i * u + i];
      }
    }
    const yBase = nc * u;
    for (let a = 0; a < nc; a++) {
      const ea = cells[a].entry;
      const aBase = a * u;
      xvx[ea * p + ea] += cells[a].count * weight[a];
      xvy[ea] += cells[a].sum * weight[a];
      for (let b = 0; b <= a; b++) {
        const bBase = b * u;
        let dot = 0;
        for (let i = 0; i < u; i++) dot += y[aBase + i] * y[bBase + i];
        const eb = cells[b].entry;
        xvx[ea * p + eb] -= dot;
        if (a !== b) xvx[eb * p + ea] -= dot;
      }
      let doty = 0;
      for (let i = 0; i < u; i++) doty += y[aBase + i] * y[yBase + i];
      xvy[ea] -= doty;
    }
    let dotyy = 0;
    for (let i = 0; i < u; i++) dotyy += y[yBase + i] * y[yBase + i];
    yvy += (env.sumSquares - sCell * cellQuad) / sRes - dotyy;
  }
  return { logDetV, xvx, xvy, yvy };
}

interface Solved {
  logDetA: number;
  cov: Float64Array;
  beta: Float64Array;
  ypy: number;
}

function solveFixed(design: Design, ev: Evaluation): Solved {
  const p = design.p;
  const l = Float64Array.from(ev.xvx);
  if (!cholesky(l, p)) {
    throw new StatsError("NOT_ESTIMABLE", "The variety means cannot be estimated from these plots.");
  }
  const cov = inverseFromCholesky(l, p);
  const beta = new Float64Array(p);
  let bb = 0;
  for (let i = 0; i < p; i++) {
    let v = 0;
    for (let j = 0; j < p; j++) v += cov[i * p + j] * ev.xvy[j];
    beta[i] = v;
    bb += v * ev.xvy[i];
  }
  return { logDetA: logDetFromCholesky(l, p), cov, beta, ypy: ev.yvy - bb };
}

const LOG_2PI = Math.log(2 * Math.PI);

/** lme4's profiled REML criterion at relative standard deviations theta (residual variance profiled out). */
function profiledCriterion(design: Design, theta: readonly number[]): number {
  const ev = evaluate(design, [theta[0] ** 2, theta[1] ** 2, theta[2] ** 2, 1]);
  const s = solveFixed(design, ev);
  const dfr = design.n - design.p;
  return ev.logDetV + s.logDetA + dfr * (1 + LOG_2PI + Math.log(s.ypy / dfr));
}

/** variances from lmerTest's variance parameters (theta_1..3, sigma) */
function variancesOf(varpar: readonly number[]): number[] {
  const s2 = varpar[3] * varpar[3];
  return [varpar[0] ** 2 * s2, varpar[1] ** 2 * s2, varpar[2] ** 2 * s2, s2];
}

/** REML deviance at lmerTest's variance parameters (theta, sigma), not profiled. */
function deviance(design: Design, varpar: readonly number[]): number {
  const ev = evaluate(design, variancesOf(varpar));
  const s = solveFixed(design, ev);
  return ev.logDetV + s.logDetA + s.ypy + (design.n - design.p) * LOG_2PI;
}

/** Minimises f over R^k by damped Newton with 4-point finite-difference derivatives. */
function minimise(f: (x: number[]) => number, start: number[]): number[] {
  const k = start.length;
  let x = start.slice();
  let fx = f(x);
  let damping = 1e-3;
  let stalled = 0;
  for (let iter = 0; iter < 200; iter++) {
    // steps large enough that rounding in a criterion of thousands stays below the curvature
    const h = x.map((v) => 1e-3 * Math.max(Math.abs(v), 0.1));
    const grad = new Array<number>(k).fill(0);
    const hess: number[][] = Array.from({ length: k }, () => new Array<number>(k).fill(0));
    const at = (i: number, di: number, j = -1, dj = 0) => {
      const y = x.slice();
      y[i] += di;
      if (j >= 0) y[j] += dj;
      return f(y);
    };
    for (let i = 0; i < k; i++) {
      const p1 = at(i, h[i]);
      const m1 = at(i, -h[i]);
      const p2 = at(i, 2 * h[i]);
      const m2 = at(i, -2 * h[i]);
      grad[i] = (8 * (p1 - m1) - (p2 - m2)) / (12 * h[i]);
      hess[i][i] = (-p2 + 16 * p1 - 30 * fx + 16 * m1 - m2) / (12 * h[i] * h[i]);
    }
    // forward mixed differences: first-order accurate, enough to point the search
    const forward = h.map((hi, i) => at(i, hi));
    for (let i = 0; i < k; i++) {
      for (let j = i + 1; j < k; j++) {
        const v = (at(i, h[i], j, h[j]) - forward[i] - forward[j] + fx) / (h[i] * h[j]);
        hess[i][j] = v;
        hess[j][i] = v;
      }
    }
    let moved = false;
    for (let attempt = 0; attempt < 40; attempt++) {
      const a = new Float64Array(k * k);
      for (let i = 0; i < k; i++) {
        for (let j = 0; j < k; j++) a[i * k + j] = hess[i][j];
        a[i * k + i] += damping * Math.max(Math.abs(hess[i][i]), 1e-8);
      }
      const inv = inverseSpd(a, k);
      if (!inv) {
        damping = Math.max(damping * 10, 1e-3);
        continue;
      }
      const step = new Array<number>(k).fill(0);
      for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) step[i] -= inv[i * k + j] * grad[j];
      const next = x.map((v, i) => v + step[i]);
      let fn: number;
      try {
        fn = f(next);
      } catch {
        fn = Number.POSITIVE_INFINITY;
      }
      if (fn <= fx + 1e-12 * Math.abs(fx)) {
        const small = step.every((s, i) => Math.abs(s) <= 1e-9 * Math.max(Math.abs(next[i]), 1e-2));
        x = next;
        const improvement = fx - fn;
        fx = fn;
        damping = Math.max(damping / 10, 1e-12);
        moved = true;
        // a variance at its boundary leaves the criterion flat: stop once it no longer improves
        stalled = improvement < 1e-11 * Math.max(Math.abs(fx), 1) ? stalled + 1 : 0;
        if (small || stalled >= 2) return x;
        break;
      }
      damping = Math.max(damping * 10, 1e-6);
    }
    if (!moved) return x;
  }
  return x;
}

/** Central second differences: good enough for a Newton direction, not for df. */
function roughHessian(f: (x: number[]) => number, x: number[]): number[][] {
  const k = x.length;
  const f0 = f(x);
  const h = x.map((v) => 1e-3 * Math.max(Math.abs(v), 0.1));
  const shifted = (pairs: [number, number][]) => {
    const y = x.slice();
    for (const [i, d] of pairs) y[i] += d;
    return f(y);
  };
  const up = h.map((hi, i) => shifted([[i, hi]]));
  const hess: number[][] = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (let i = 0; i < k; i++) {
    hess[i][i] = (up[i] - 2 * f0 + shifted([[i, -h[i]]])) / (h[i] * h[i]);
    for (let j = 0; j < i; j++) {
      const v = (shifted([[i, h[i]], [j, h[j]]]) - up[i] - up[j] + f0) / (h[i] * h[j]);
      hess[i][j] = v;
      hess[j][i] = v;
    }
  }
  return hess;
}

/**
 * A small relative standard deviation whose variance has a non-negative slope at zero is at the
 * boundary: set it to exactly zero (the criterion is too flat there for Newton steps to get it below
 * lme4's 1e-4 singularity tolerance).
 */
function toBoundary(f: (x: number[]) => number, x0: number[]): number[] {
  const x = x0.slice();
  for (let i = 0; i < x.length; i++) {
    if (Math.abs(x[i]) > 1e-2) continue;
    const zero = x.slice();
    zero[i] = 0;
    const nudged = x.slice();
    nudged[i] = 1e-4; // variance ratio 1e-8
    const f0 = f(zero);
    if (f(nudged) >= f0 && f0 <= f(x) + 1e-9 * Math.max(Math.abs(f0), 1)) x[i] = 0;
  }
  return x;
}

/**
 * One Newton step with Richardson-extrapolated derivatives: the damped search stops where
 * plain differences lose precision, and the environment variance lies along a flat direction.
 */
function polish(f: (x: number[]) => number, x0: number[]): number[] {
  let x = x0;
  let fx = f(x);
  for (let step = 0; step < 1; step++) {
    const active = x.map((v) => Math.abs(v) > 1e-3);
    const idx = active.flatMap((on, i) => (on ? [i] : []));
    if (idx.length === 0) return x;
    const sub = (y: number[]) => {
      const full = x.slice();
      idx.forEach((i, k) => (full[i] = y[k]));
      return f(full);
    };
    const y0 = idx.map((i) => x[i]);
    const grad = numericJacobian((y) => Float64Array.of(sub(y)), y0).map((g) => g[0]);
    const hess = roughHessian(sub, y0);
    const k = idx.length;
    const a = new Float64Array(k * k);
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) a[i * k + j] = hess[i][j];
    const inv = inverseSpd(a, k);
    if (!inv) return x;
    const next = x.slice();
    idx.forEach((i, r) => {
      let d = 0;
      for (let c = 0; c < k; c++) d += inv[r * k + c] * grad[c];
      next[i] -= d;
    });
    const fn = f(next);
    if (!(fn <= fx)) return x;
    x = next;
    fx = fn;
  }
  return x;
}

/** Richardson-extrapolated central differences (numDeriv's scheme: 4 halvings of a 10% step). */
function richardson(g: (h: number) => Float64Array, h0: number): Float64Array {
  const levels = 4;
  const table: Float64Array[] = [];
  for (let r = 0; r < levels; r++) table.push(g(h0 / 2 ** r));
  for (let m = 1; m < levels; m++) {
    const factor = 4 ** m;
    for (let r = levels - 1; r >= m; r--) {
      const a = table[r];
      const b = table[r - 1];
      const c = new Float64Array(a.length);
      for (let i = 0; i < a.length; i++) c[i] = (factor * a[i] - b[i]) / (factor - 1);
      table[r] = c;
    }
  }
  return table[levels - 1];
}

function stepFor(x: number): number {
  return Math.abs(x) > 1e-6 ? 0.1 * Math.abs(x) : 1e-4;
}

/** Hessian of f at x by Richardson-extrapolated central differences. */
function numericHessian(f: (x: number[]) => number, x: number[]): number[][] {
  const k = x.length;
  const f0 = f(x);
  const hess: number[][] = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (let i = 0; i < k; i++) {
    const hi = stepFor(x[i]);
    hess[i][i] = richardson(
      (h) => {
        const up = x.slice();
        up[i] += h;
        const down = x.slice();
        down[i] -= h;
        return Float64Array.of((f(up) - 2 * f0 + f(down)) / (h * h));
      },
      hi,
    )[0];
    for (let j = 0; j < i; j++) {
      const hj = stepFor(x[j]);
      const value = richardson(
        (t) => {
          const a = hi * (t / hi);
          const b = hj * (t / hi);
          const pp = x.slice();
          pp[i] += a;
          pp[j] += b;
          const mm = x.slice();
          mm[i] -= a;
          mm[j] -= b;
          const pm = x.slice();
          pm[i] += a;
          pm[j] -= b;
          const mp = x.slice();
          mp[i] -= a;
          mp[j] += b;
          return Float64Array.of((f(pp) - f(pm) - f(mp) + f(mm)) / (4 * a * b));
        },
        hi,
      )[0];
      hess[i][j] = value;
      hess[j][i] = value;
    }
  }
  return hess;
}

function numericJacobian(f: (x: number[]) => Float64Array, x: number[]): Float64Array[] {
  return x.map((xi, i) =>
    richardson(
      (h) => {
        const up = x.slice();
        up[i] += h;
        const down = x.slice();
        down[i] -= h;
        const a = f(up);
        const b = f(down);
        const d = new Float64Array(a.length);
        for (let t = 0; t < a.length; t++) d[t] = (a[t] - b[t]) / (2 * h);
        return d;
      },
      stepFor(xi),
    ),
  );
}

function quadForm(v: ArrayLike<number>, a: Float64Array, size: number): number {
  let s = 0;
  for (let i = 0; i < size; i++) {
    if (v[i] === 0) continue;
    let row = 0;
    for (let j = 0; j < size; j++) row += a[i * size + j] * v[j];
    s += v[i] * row;
  }
  return s;
}

/** Symmetric eigen-decomposition by cyclic Jacobi rotations; values descending. */
function symmetricEigen(a: number[][]): { values: number[]; vectors: number[][] } {
  const n = a.length;
  const m = a.map((row) => row.slice());
  const v: number[][] = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (__, j) => (i === j ? 1 : 0)));
  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) off += m[i][j] * m[i][j];
    if (off < 1e-30) break;
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        if (Math.abs(m[p][q]) < 1e-300) continue;
        const theta = (m[q][q] - m[p][p]) / (2 * m[p][q]);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const mkp = m[k][p];
          const mkq = m[k][q];
          m[k][p] = c * mkp - s * mkq;
          m[k][q] = s * mkp + c * mkq;
        }
        for (let k = 0; k < n; k++) {
          const mpk = m[p][k];
          const mqk = m[q][k];
          m[p][k] = c * mpk - s * mqk;
          m[q][k] = s * mpk + c * mqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k][p];
          const vkq = v[k][q];
          v[k][p] = c * vkp - s * vkq;
          v[k][q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => m[j][j] - m[i][i]);
  return {
    values: order.map((i) => m[i][i]),
    vectors: order.map((i) => v.map((row) => row[i])),
  };
}

/**
 * lmerTest's contrasts for the entry F test: the entry rows of the transposed unit lower factor of
 * a Doolittle factorisation of X'X in R's default (intercept + treatment) coding, mapped to the
 * cell-means parameterisation used here. The Satterthwaite F df depend on this basis.
 */
function entryContrasts(counts: Float64Array): number[][] {
  const p = counts.length;
  // X_lmer = X_cell K, K: column 0 all ones (intercept), column j>0 = e_j
  const xtx: number[][] = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  let total = 0;
  for (let i = 0; i < p; i++) total += counts[i];
  xtx[0][0] = total;
  for (let j = 1; j < p; j++) {
    xtx[0][j] = counts[j];
    xtx[j][0] = counts[j];
    xtx[j][j] = counts[j];
  }
  const eps = 1e-6;
  const lower: number[][] = Array.from({ length: p }, (_, i) => Array.from({ length: p }, (__, j) => (i === j ? 1 : 0)));
  const upper: number[][] = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      let v = xtx[i][j];
      for (let k = 0; k < i; k++) v -= lower[i][k] * upper[k][j];
      upper[i][j] = v;
    }
    for (let j = i + 1; j < p; j++) {
      let v = xtx[j][i];
      for (let k = 0; k < i; k++) v -= lower[j][k] * upper[k][i];
      lower[j][i] = Math.abs(upper[i][i]) < eps ? 0 : v / upper[i][i];
    }
  }
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) if (Math.abs(lower[i][j]) < eps) lower[i][j] = 0;
  const rows: number[][] = [];
  for (let r = 1; r < p; r++) {
    // row r of t(L) in lmer coding: coefficients on (intercept, effect_1..)
    const lmerRow = lower.map((row) => row[r]);
    // beta_lmer = Kinv beta_cell: intercept = cell_0, effect_j = cell_j - cell_0
    const cellRow = new Array<number>(p).fill(0);
    cellRow[0] += lmerRow[0];
    for (let j = 1; j < p; j++) {
      cellRow[j] += lmerRow[j];
      cellRow[0] -= lmerRow[j];
    }
    rows.push(cellRow);
  }
  return rows;
}

/** lmerTest's combination of per-direction t df into one F denominator df. */
function combineDf(nu: number[]): number {
  if (nu.length === 1) return nu[0];
  if (nu.every((v) => Math.abs(v - nu[0]) < 1e-8)) return nu.reduce((a, b) => a + b, 0) / nu.length;
  if (nu.some((v) => v <= 2)) return 2;
  const e = nu.reduce((s, v) => s + v / (v - 2), 0);
  return (2 * e) / (e - nu.length);
}

interface FitState {
  design: Design;
  varpar: number[];
  variances: number[];
  cov: Float64Array;
  beta: Float64Array;
  remlCriterion: number;
  singular: boolean;
}

function fit(design: Design): FitState {
  const criterion = (theta: number[]) => profiledCriterion(design, theta);
  const start = [1, 1, 1];
  let theta = polish(criterion, toBoundary(criterion, minimise(criterion, start)));
  // the criterion is even in each theta: report the non-negative root, and a vanished one as zero
  theta = theta.map((t) => Math.abs(t));
  const ev = evaluate(design, [theta[0] ** 2, theta[1] ** 2, theta[2] ** 2, 1]);
  const solved = solveFixed(design, ev);
  const dfr = design.n - design.p;
  const sigma2 = solved.ypy / dfr;
  const varpar = [theta[0], theta[1], theta[2], Math.sqrt(sigma2)];
  const variances = variancesOf(varpar);
  const full = solveFixed(design, evaluate(design, variances));
  return {
    design,
    varpar,
    variances,
    cov: full.cov,
    beta: full.beta,
    remlCriterion: criterion(theta),
    singular: theta.some((t) => t < SINGULAR_TOLERANCE),
  };
}

interface DfEngine {
  /** covariance of the fixed effects used for SE (adjusted under Kenward-Roger) */
  cov: Float64Array;
  tDf(l: number[]): number;
  fTest(rows: number[][]): { numDf: number; denDf: number; f: number };
}

function satterthwaite(state: FitState): DfEngine {
  const { design, varpar } = state;
  const p = design.p;
  const hess = numericHessian((x) => deviance(design, x), varpar);
  const h = new Float64Array(16);
  for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) h[i * 4 + j] = hess[i][j];
  const hInv = inverseSpd(h, 4) ?? generalInverse4(hess);
  const vcovVarpar = hInv.map((v) => 2 * v);
  const jac = numericJacobian((x) => solveFixed(design, evaluate(design, variancesOf(x))).cov, varpar);
  const gradient = (l: ArrayLike<number>) => jac.map((j) => quadForm(l, j, p));
  const tDf = (l: ArrayLike<number>) => {
    const v = quadForm(l, state.cov, p);
    const g = gradient(l);
    return (2 * v * v) / quadForm(g, vcovVarpar, 4);
  };
  return {
    cov: state.cov,
    tDf,
    fTest(rows) {
      const q0 = rows.length;
      const vl: number[][] = rows.map((a) => rows.map((b) => bilinear(a, state.cov, b, p)));
      const eig = symmetricEigen(vl);
      const tol = Math.max(Math.sqrt(Number.EPSILON) * eig.values[0], 0);
      const keep = eig.values.map((d, i) => i).filter((i) => eig.values[i] > tol);
      let f = 0;
      const nu: number[] = [];
      for (const m of keep) {
        const direction = new Array<number>(p).fill(0);
        for (let r = 0; r < q0; r++) for (let c = 0; c < p; c++) direction[c] += eig.vectors[m][r] * rows[r][c];
        let est = 0;
        for (let c = 0; c < p; c++) est += direction[c] * state.beta[c];
        f += (est * est) / eig.values[m];
        const g = gradient(direction);
        nu.push((2 * eig.values[m] ** 2) / quadForm(g, vcovVarpar, 4));
      }
      return { numDf: keep.length, denDf: combineDf(nu), f: f / keep.length };
    },
  };
}

function generalInverse4(hess: number[][]): Float64Array {
  const eig = symmetricEigen(hess);
  const out = new Float64Array(16);
  const tol = Math.max(...eig.values.map(Math.abs)) * 1e-10;
  eig.values.forEach((d, m) => {
    if (Math.abs(d) <= tol) return;
    for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) out[i * 4 + j] += (eig.vectors[m][i] * eig.vectors[m][j]) / d;
  });
  return out;
}

function bilinear(a: ArrayLike<number>, m: Float64Array, b: ArrayLike<number>, size: number): number {
  let s = 0;
  for (let i = 0; i < size; i++) {
    if (a[i] === 0) continue;
    let row = 0;
    for (let j = 0; j < size; j++) row += m[i * size + j] * b[j];
    s += a[i] * row;
  }
  return s;
}

function matMul(a: Float64Array, b: Float64Array, rows: number, inner: number, cols: number): Float64Array {
  const out = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) {
    for (let k = 0; k < inner; k++) {
      const v = a[i * inner + k];
      if (v === 0) continue;
      for (let j = 0; j < cols; j++) out[i * cols + j] += v * b[k * cols + j];
    }
  }
  return out;
}

function transpose(a: Float64Array, rows: number, cols: number): Float64Array {
  const out = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) out[j * rows + i] = a[i * cols + j];
  return out;
}

/**
 * Kenward-Roger (1997) as pbkrtest computes it: the expected information of the variances, the
 * adjusted covariance Phi_A = Phi + 2 Phi U Phi, and per hypothesis the scaled F and its df. Built
 * densely per environment (V is block diagonal), so it is meant for trial-sized data.
 */
function kenwardRoger(state: FitState): DfEngine {
  const { design, variances } = state;
  const p = design.p;
  const r = 4;
  const phi = state.cov;
  const pp: Float64Array[] = Array.from({ length: r }, () => new Float64Array(p * p));
  const qq: Float64Array[][] = Array.from({ length: r }, () => Array.from({ length: r }, () => new Float64Array(p * p)));
  const ktrace: number[][] = Array.from({ length: r }, () => new Array<number>(r).fill(0));
  for (const env of design.environments) {
    const m = env.plots.length;
    const g: Float64Array[] = Array.from({ length: r }, () => new Float64Array(m * m));
    for (let a = 0; a < m; a++) {
      for (let b = 0; b < m; b++) {
        const pa = env.plots[a];
        const pb = env.plots[b];
        g[0][a * m + b] = 1;
        if (pa.block === pb.block) g[1][a * m + b] = 1;
        if (pa.cell === pb.cell) g[2][a * m + b] = 1;
        if (a === b) g[3][a * m + b] = 1;
      }
    }
    const sigma = new Float64Array(m * m);
    for (let t = 0; t < r; t++) for (let i = 0; i < m * m; i++) sigma[i] += variances[t] * g[t][i];
    const sigmaInv = inverseSpd(sigma, m);
    if (!sigmaInv) throw new StatsError("NOT_ESTIMABLE", "The mixed model could not be fitted (variances out of range).");
    const x = new Float64Array(m * p);
    env.plots.forEach((plot, a) => {
      x[a * p + env.cells[plot.cell].entry] = 1;
    });
    const tt = matMul(sigmaInv, x, m, m, p);
    const hh = g.map((gt) => matMul(gt, sigmaInv, m, m, m));
    const oo = hh.map((h) => matMul(h, x, m, m, p));
    const ooT = oo.map((o) => transpose(o, m, p));
    const sigmaInvOo = oo.map((o) => matMul(sigmaInv, o, m, m, p));
    for (let a = 0; a < r; a++) {
      const pa = matMul(ooT[a], tt, p, m, p);
      for (let i = 0; i < p * p; i++) pp[a][i] -= pa[i];
      for (let b = a; b < r; b++) {
        const q = matMul(ooT[a], sigmaInvOo[b], p, m, p);
        for (let i = 0; i < p * p; i++) qq[a][b][i] += q[i];
        let tr = 0;
        for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) tr += hh[a][i * m + j] * hh[b][j * m + i];
        ktrace[a][b] += tr;
      }
    }
  }
  const ie = new Float64Array(r * r);
  for (let a = 0; a < r; a++) {
    const phiPa = matMul(phi, pp[a], p, p, p);
    for (let b = a; b < r; b++) {
      const pbPhi = matMul(pp[b], phi, p, p, p);
      let s1 = 0;
      let s2 = 0;
      for (let i = 0; i < p * p; i++) {
        s1 += phi[i] * qq[a][b][i];
        s2 += phiPa[i] * pbPhi[i];
      }
      const v = ktrace[a][b] - 2 * s1 + s2;
      ie[a * r + b] = v;
      ie[b * r + a] = v;
    }
  }
  const ieRows = Array.from({ length: r }, (_, i) => Array.from(ie.slice(i * r, i * r + r)));
  const eig = symmetricEigen(ieRows);
  const condi = Math.min(...eig.values.map(Math.abs));
  const ieInv = condi > 1e-10 ? (inverseSpd(ie, r) ?? generalInverse4(ieRows)) : generalInverse4(ieRows);
  const w = ieInv.map((v) => 2 * v);
  const uu = new Float64Array(p * p);
  for (let a = 0; a < r; a++) {
    for (let b = a; b < r; b++) {
      const ppp = matMul(matMul(pp[a], phi, p, p, p), pp[b], p, p, p);
      const coefficient = w[a * r + b];
      for (let i = 0; i < p; i++) {
        for (let j = 0; j < p; j++) {
          const term = coefficient * (qq[a][b][i * p + j] - ppp[i * p + j]);
          uu[i * p + j] += term;
          if (a !== b) uu[j * p + i] += term;
        }
      }
    }
  }
  const gamma = matMul(matMul(phi, uu, p, p, p), phi, p, p, p);
  const phiA = new Float64Array(p * p);
  for (let i = 0; i < p * p; i++) phiA[i] = phi[i] + 2 * gamma[i];

  const adjust = (rows: number[][]) => {
    const q = rows.length;
    const lm = new Float64Array(q * p);
    rows.forEach((row, i) => row.forEach((v, j) => (lm[i * p + j] = v)));
    const lPhiLt = matMul(matMul(lm, phi, q, p, p), transpose(lm, q, p), q, p, q);
    const inner = inverseSpd(lPhiLt, q);
    if (!inner) throw new StatsError("NOT_ESTIMABLE", "The variety comparison cannot be estimated from these plots.");
    const theta = matMul(matMul(transpose(lm, q, p), inner, p, q, q), lm, p, q, p);
    const thetaPhi = matMul(theta, phi, p, p, p);
    const ui = pp.map((pa) => matMul(matMul(thetaPhi, pa, p, p, p), phi, p, p, p));
    const trace = (a: Float64Array) => {
      let s = 0;
      for (let i = 0; i < p; i++) s += a[i * p + i];
      return s;
    };
    let a1 = 0;
    let a2 = 0;
    for (let i = 0; i < r; i++) {
      for (let j = i; j < r; j++) {
        const e = i === j ? 1 : 2;
        a1 += e * w[i * r + j] * trace(ui[i]) * trace(ui[j]);
        let s = 0;
        for (let x = 0; x < p; x++) for (let y = 0; y < p; y++) s += ui[i][x * p + y] * ui[j][y * p + x];
        a2 += e * w[i * r + j] * s;
      }
    }
    const b = (1 / (2 * q)) * (a1 + 6 * a2);
    const gg = ((q + 1) * a1 - (q + 4) * a2) / ((q + 2) * a2);
    const c1 = gg / (3 * q + 2 * (1 - gg));
    const c2 = (q - gg) / (3 * q + 2 * (1 - gg));
    const c3 = (q + 2 - gg) / (3 * q + 2 * (1 - gg));
    let v0 = 1 + c1 * b;
    const v1 = 1 - c2 * b;
    const v2 = 1 - c3 * b;
    if (Math.abs(v0) < 1e-10) v0 = 0;
    const ratio = v1 === 0 ? 0 : (1 - a2 / q) / v1;
    const rho = (1 / q) * ratio * ratio * (v0 / v2);
    const ddf = 4 + (q + 2) / (q * rho - 1);
    const scaling = Math.abs(ddf - 4) < 1e-2 ? Number.NaN : (ddf * (1 - a2 / q)) / (ddf - 2);
    return { q, ddf, scaling, lm };
  };
  return {
    cov: phiA,
    tDf: (l) => adjust([l]).ddf,
    fTest(rows) {
      const { q, ddf, scaling, lm } = adjust(rows);
      const lb = matMul(lm, state.beta, q, p, 1);
      const lAl = matMul(matMul(lm, phiA, q, p, p), transpose(lm, q, p), q, p, q);
      const inv = inverseSpd(lAl, q);
      if (!inv) throw new StatsError("NOT_ESTIMABLE", "The variety comparison cannot be estimated from these plots.");
      const wald = quadForm(lb, inv, q);
      return { numDf: q, denDf: ddf, f: (scaling * wald) / q };
    },
  };
}

/**
 * Fits the REML mixed model with entries fixed and environments, blocks within environments and the
 * entry x environment interaction random. Throws a StatsError on fewer than two environments or
 * entries, a non-finite value, or an expected entry (opts.entries) without plots.
 */
export function mixedModel(data: readonly MixedPlot[], opts: MixedModelOptions = {}): MixedModelResult {
  const method = opts.df ?? "satterthwaite";
  if (method !== "satterthwaite" && method !== "kenward-roger") {
    throw new StatsError("INVALID_ARGUMENT", `The df method must be "satterthwaite" or "kenward-roger" (got ${String(method)}).`);
  }
  const design = buildDesign(data, opts);
  const state = fit(design);
  const engine = method === "kenward-roger" ? kenwardRoger(state) : satterthwaite(state);
  const p = design.p;
  const unit = (i: number) => {
    const l = new Array<number>(p).fill(0);
    l[i] = 1;
    return l;
  };
  const entryMeans = design.entries.map((entry, i) => ({
    entry,
    mean: state.beta[i],
    se: Math.sqrt(engine.cov[i * p + i]),
    df: engine.tDf(unit(i)),
  }));
  const pairs: MixedModelResult["pairs"] = [];
  for (let i = 0; i < p; i++) {
    for (let j = i + 1; j < p; j++) {
      const l = new Array<number>(p).fill(0);
      l[i] = 1;
      l[j] = -1;
      const diff = state.beta[i] - state.beta[j];
      const se = Math.sqrt(quadForm(l, engine.cov, p));
      const df = engine.tDf(l);
      const t = diff / se;
      pairs.push({ a: design.entries[i], b: design.entries[j], diff, se, df, t, p: studentTTwoSided(t, df) });
    }
  }
  const test = engine.fTest(entryContrasts(design.counts));
  const components = [
    ...RANDOM_TERMS.map((term, i) => ({ term, variance: state.variances[i] })),
    { term: "residual" as const, variance: state.variances[3] },
  ];
  return {
    components,
    remlCriterion: state.remlCriterion,
    singular: state.singular,
    n: design.n,
    entryTest: { ...test, p: fUpper(test.f, test.numDf, test.denDf) },
    entryMeans,
    pairs,
    environments: design.environments.map((env) => env.name),
    dfMethod: method,
  };
}
