/**
 * Probability and quantile functions used by the analyses. Upper tails are computed directly
 * from the incomplete beta and gamma functions (never as 1 - cdf), so p-values far below 1e-12
 * keep their relative accuracy. jstat is deliberately not used here: its upper tails are 1 - cdf
 * (p underflows to 0) and its t quantile is good to only about 1e-8 (checked against R's qt).
 */
import { StatsError } from "./errors";
import { integrate } from "./integration";
import { erfc, incompleteBetaTails, incompleteGammaTails, log1pMinusX, stirlingRemainder } from "./special-functions";

const SQRT1_2 = Math.SQRT1_2;
const LOG_SQRT_2PI = 0.91893853320467274178;

function requirePositive(name: string, value: number): void {
  if (!(value > 0) || Number.isNaN(value)) {
    throw new StatsError("INVALID_ARGUMENT", `${name} must be a positive number (got ${value}).`, { [name]: value });
  }
}

function requireProbability(p: number): void {
  if (!(p > 0 && p < 1)) {
    throw new StatsError("INVALID_PROBABILITY", `A probability strictly between 0 and 1 is needed (got ${p}).`, { p });
  }
}

// ---------------------------------------------------------------- normal

/** P(Z > z) for a standard normal Z; accurate to full relative precision far into the tail. */
export function normalUpper(z: number): number {
  return 0.5 * erfc(z * SQRT1_2);
}

/** P(Z <= z) for a standard normal Z. */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z * SQRT1_2);
}

/** Standard normal density. */
export function normalDensity(z: number): number {
  return Math.exp(-0.5 * z * z - LOG_SQRT_2PI);
}

/** z with P(Z <= z) = p (Newton iterations on the accurate tail, started from a logistic guess). */
export function normalQuantile(p: number): number {
  requireProbability(p);
  if (p === 0.5) return 0;
  // work in the smaller tail so the target keeps its relative precision
  const tail = p < 0.5 ? p : 1 - p;
  let z = Math.sqrt(-2 * Math.log(tail)); // rough start, refined below
  z = z - (2.515517 + 0.802853 * z + 0.010328 * z * z) / (1 + 1.432788 * z + 0.189269 * z * z + 0.001308 * z * z * z);
  for (let i = 0; i < 50; i++) {
    const upper = normalUpper(z);
    // Newton on log(upper) is well conditioned in the far tail
    const step = ((Math.log(upper) - Math.log(tail)) * upper) / normalDensity(z);
    z += step;
    if (Math.abs(step) <= 1e-16 * Math.max(1, Math.abs(z))) break;
  }
  return p < 0.5 ? -z : z;
}

// ---------------------------------------------------------------- Student t

/** P(T > t) for Student's t with df degrees of freedom (df may be fractional). */
export function studentTUpper(t: number, df: number): number {
  requirePositive("df", df);
  if (Number.isNaN(t)) return Number.NaN;
  if (t === Infinity) return 0;
  if (t === -Infinity) return 1;
  const t2 = t * t;
  // P(|T| > |t|) = I_{df/(df+t^2)}(df/2, 1/2), with both beta arguments formed without cancellation
  const twoSided = incompleteBetaTails(df / 2, 0.5, df / (df + t2), t2 / (df + t2)).lower;
  return t >= 0 ? 0.5 * twoSided : 1 - 0.5 * twoSided;
}

/** P(|T| > |t|): the two-sided p-value of a t statistic. */
export function studentTTwoSided(t: number, df: number): number {
  requirePositive("df", df);
  if (Number.isNaN(t)) return Number.NaN;
  if (!Number.isFinite(t)) return 0;
  const t2 = t * t;
  return incompleteBetaTails(df / 2, 0.5, df / (df + t2), t2 / (df + t2)).lower;
}

/** P(T <= t). */
export function studentTCdf(t: number, df: number): number {
  return studentTUpper(-t, df);
}

/** t with P(T <= t) = p (e.g. p = 0.975 gives the two-sided 5% critical value). */
export function studentTQuantile(p: number, df: number): number {
  requirePositive("df", df);
  requireProbability(p);
  if (p === 0.5) return 0;
  const tail = p < 0.5 ? p : 1 - p;
  const t = solveDecreasing((x) => studentTUpper(x, df), tail, 0, 1);
  return p < 0.5 ? -t : t;
}

// ---------------------------------------------------------------- F

/** P(F > f) for the F distribution with df1 (numerator) and df2 (denominator) degrees of freedom. */
export function fUpper(f: number, df1: number, df2: number): number {
  requirePositive("df1", df1);
  requirePositive("df2", df2);
  if (Number.isNaN(f)) return Number.NaN;
  if (f <= 0) return 1;
  if (f === Infinity) return 0;
  const denominator = df1 * f + df2;
  return incompleteBetaTails(df1 / 2, df2 / 2, (df1 * f) / denominator, df2 / denominator).upper;
}

/** P(F <= f). */
export function fCdf(f: number, df1: number, df2: number): number {
  requirePositive("df1", df1);
  requirePositive("df2", df2);
  if (Number.isNaN(f)) return Number.NaN;
  if (f <= 0) return 0;
  if (f === Infinity) return 1;
  const denominator = df1 * f + df2;
  return incompleteBetaTails(df1 / 2, df2 / 2, (df1 * f) / denominator, df2 / denominator).lower;
}

/** f with P(F <= f) = p (p = 0.95 gives the upper 5% point). */
export function fQuantile(p: number, df1: number, df2: number): number {
  requirePositive("df1", df1);
  requirePositive("df2", df2);
  requireProbability(p);
  return p >= 0.5
    ? solveDecreasing((x) => fUpper(x, df1, df2), 1 - p, 0, 1)
    : solveIncreasing((x) => fCdf(x, df1, df2), p, 0, 1);
}

// ---------------------------------------------------------------- chi-square

/** P(X > x) for chi-square with df degrees of freedom. */
export function chiSquareUpper(x: number, df: number): number {
  requirePositive("df", df);
  if (Number.isNaN(x)) return Number.NaN;
  if (x <= 0) return 1;
  return incompleteGammaTails(df / 2, x / 2).upper;
}

/** P(X <= x). */
export function chiSquareCdf(x: number, df: number): number {
  requirePositive("df", df);
  if (Number.isNaN(x)) return Number.NaN;
  if (x <= 0) return 0;
  return incompleteGammaTails(df / 2, x / 2).lower;
}

/** x with P(X <= x) = p (p = 0.95 gives the upper 5% point). */
export function chiSquareQuantile(p: number, df: number): number {
  requirePositive("df", df);
  requireProbability(p);
  return p >= 0.5
    ? solveDecreasing((x) => chiSquareUpper(x, df), 1 - p, 0, Math.max(df, 1))
    : solveIncreasing((x) => chiSquareCdf(x, df), p, 0, Math.max(df, 1));
}

// ---------------------------------------------------------------- studentized range

/**
 * P(W >= w) for the range W of k independent standard normals, written so the upper tail is
 * integrated directly: k * integral of phi(z) [Q(z)^(k-1) - (Q(z) - Q(z+w))^(k-1)] dz, Q = upper
 * normal tail (the classical range integral of Hartley 1942, rearranged for the upper tail).
 */
export function normalRangeUpper(w: number, k: number): number {
  if (!(w > 0)) return 1;
  if (w === Infinity) return 0;
  const km1 = k - 1;
  const integrand = (z: number): number => {
    const tailAtMin = normalUpper(z);
    if (tailAtMin === 0) return 0;
    const ratio = normalUpper(z + w) / tailAtMin;
    const notAllWithin = -Math.expm1(km1 * Math.log1p(-ratio));
    return k * normalDensity(z) * Math.exp(km1 * Math.log(tailAtMin)) * notAllWithin;
  };
  const centre = -w / 2; // where phi(z) Q(z + w) peaks when w is large
  const from = Math.min(-9, centre - 9);
  return integrate(integrand, from, 9, {
    relativeTolerance: 1e-13,
    breakpoints: centre < -1 ? [centre, 0] : [0],
  });
}

// Pieces of [0, 40] on which log P(W >= w) is interpolated. Beyond 40 the tail is below 1e-150
// and is integrated directly (slower, but only reached for p-values of that size).
const RANGE_PIECES = [0, 0.5, 1, 2, 3, 4, 6, 8, 12, 16, 24, 32, 40];
const INTERPOLATED_RANGE_LIMIT = 40;
const CHEBYSHEV_DEGREE = 28;
const rangeTailCache = new Map<number, Float64Array[]>();

/**
 * Chebyshev coefficients of log P(W >= w) on each piece, for one k. The range tail does not depend
 * on the error df, so one table per k serves every Tukey comparison; each coefficient set is
 * computed from CHEBYSHEV_DEGREE direct integrations (interpolation error about 1e-14 in log p).
 */
function rangeTailTable(k: number): Float64Array[] {
  const cached = rangeTailCache.get(k);
  if (cached) return cached;
  const n = CHEBYSHEV_DEGREE;
  const table: Float64Array[] = [];
  for (let piece = 0; piece + 1 < RANGE_PIECES.length; piece++) {
    const from = RANGE_PIECES[piece];
    const to = RANGE_PIECES[piece + 1];
    const values = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      const node = Math.cos((Math.PI * (j + 0.5)) / n);
      values[j] = Math.log(normalRangeUpper(from + ((node + 1) * (to - from)) / 2, k));
    }
    const coefficients = new Float64Array(n);
    for (let m = 0; m < n; m++) {
      let sum = 0;
      for (let j = 0; j < n; j++) sum += values[j] * Math.cos((Math.PI * m * (j + 0.5)) / n);
      coefficients[m] = (2 * sum) / n;
    }
    table.push(coefficients);
  }
  rangeTailCache.set(k, table);
  return table;
}

/** P(W >= w) for the range of k standard normals, from the cached Chebyshev table (Clenshaw sum). */
function rangeUpperInterpolated(w: number, table: Float64Array[], k: number): number {
  if (!(w > 0)) return 1;
  if (w >= INTERPOLATED_RANGE_LIMIT) return normalRangeUpper(w, k);
  let piece = 0;
  while (w > RANGE_PIECES[piece + 1]) piece++;
  const from = RANGE_PIECES[piece];
  const to = RANGE_PIECES[piece + 1];
  const x = (2 * w - from - to) / (to - from);
  const coefficients = table[piece];
  let b1 = 0;
  let b2 = 0;
  for (let m = coefficients.length - 1; m >= 1; m--) {
    const next = 2 * x * b1 - b2 + coefficients[m];
    b2 = b1;
    b1 = next;
  }
  return Math.exp(x * b1 - b2 + 0.5 * coefficients[0]);
}

/**
 * P(Q >= q) for the studentized range with k means and df error degrees of freedom: the range
 * tail averaged over the distribution of s = sqrt(chi^2_df / df), by adaptive Gauss-Kronrod
 * (the double integral of Lund & Lund 1983, AS 190, and Copenhaver & Holland 1988, but
 * integrating the upper tail itself so small p keep their relative accuracy). df = Infinity allowed.
 */
export function studentizedRangeUpper(q: number, k: number, df: number): number {
  if (!(k >= 2) || !Number.isInteger(k)) {
    throw new StatsError("INVALID_ARGUMENT", `The number of means must be a whole number of at least 2 (got ${k}).`, { k });
  }
  requirePositive("df", df);
  if (Number.isNaN(q)) return Number.NaN;
  if (q <= 0) return 1;
  const table = rangeTailTable(k);
  if (df === Infinity || df > 1e8) return rangeUpperInterpolated(q, table, k);
  const a = df / 2;
  // log density of s = sqrt(chi^2_df / df), with the Stirling terms cancelled (see special-functions)
  const logConstant = Math.log(2 * Math.sqrt(a)) - LOG_SQRT_2PI - stirlingRemainder(a);
  const integrand = (s: number): number => {
    if (s <= 0) return 0;
    const logDensity = logConstant - Math.log(s) + a * log1pMinusX(s * s - 1);
    return logDensity < -745 ? 0 : Math.exp(logDensity) * rangeUpperInterpolated(q * s, table, k);
  };
  let sHigh = 2;
  while (a * log1pMinusX(sHigh * sHigh - 1) - Math.log(sHigh) > -60) sHigh *= 1.5;
  const spread = 1 / Math.sqrt(2 * df);
  const breakpoints = [-8, -4, -2, 0, 2, 4, 8].map((m) => 1 + m * spread).filter((s) => s > 0 && s < sHigh);
  return integrate(integrand, 0, sHigh, { relativeTolerance: 1e-12, breakpoints });
}

/** P(Q <= q) for the studentized range (k means, df error degrees of freedom). */
export function studentizedRangeCdf(q: number, k: number, df: number): number {
  return 1 - studentizedRangeUpper(q, k, df);
}

/** q with P(Q <= q) = p, solved to about 1e-12 relative (R's qtukey stops at about 1e-4). */
export function studentizedRangeQuantile(p: number, k: number, df: number): number {
  requireProbability(p);
  return p >= 0.5
    ? solveDecreasing((x) => studentizedRangeUpper(x, k, df), 1 - p, 0, 3, 1e-13)
    : solveIncreasing((x) => studentizedRangeCdf(x, k, df), p, 0, 3, 1e-13);
}

// ---------------------------------------------------------------- root finding

/**
 * x >= lowerBound with tail(x) = target, for a tail decreasing in x. Works on log(tail) so tiny
 * targets are solved to relative precision; root by Brent's method (Brent 1973, "zeroin").
 */
function solveDecreasing(
  tail: (x: number) => number,
  target: number,
  lowerBound: number,
  start: number,
  tolerance = 1e-15,
): number {
  const logTarget = Math.log(target);
  const g = (x: number): number => Math.log(tail(x)) - logTarget;
  let low = lowerBound;
  let high = start;
  let gHigh = g(high);
  while (gHigh > 0) {
    low = high;
    high *= 2;
    gHigh = g(high);
  }
  let gLow = g(low);
  if (gLow === -Infinity || Number.isNaN(gLow)) gLow = Number.MAX_VALUE; // tail(lowerBound) = 1 > target
  return brent(g, low, high, gLow, gHigh, tolerance);
}

function solveIncreasing(
  cdf: (x: number) => number,
  target: number,
  lowerBound: number,
  start: number,
  tolerance = 1e-15,
): number {
  const logTarget = Math.log(target);
  const g = (x: number): number => {
    const value = cdf(x);
    return value <= 0 ? -Number.MAX_VALUE : Math.log(value) - logTarget;
  };
  let low = lowerBound;
  let high = start;
  let gHigh = g(high);
  while (gHigh < 0) {
    low = high;
    high *= 2;
    gHigh = g(high);
  }
  return brent(g, low, high, g(low), gHigh, tolerance);
}

/** Brent's root finder on a bracket [a, b] with g(a), g(b) of opposite signs. */
function brent(g: (x: number) => number, a: number, b: number, ga: number, gb: number, tolerance: number): number {
  let c = a;
  let gc = ga;
  let d = b - a;
  let e = d;
  for (let iteration = 0; iteration < 200; iteration++) {
    if ((gb > 0 && gc > 0) || (gb < 0 && gc < 0)) {
      c = a;
      gc = ga;
      d = b - a;
      e = d;
    }
    if (Math.abs(gc) < Math.abs(gb)) {
      a = b;
      b = c;
      c = a;
      ga = gb;
      gb = gc;
      gc = ga;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 0.5 * tolerance * Math.abs(b);
    const half = 0.5 * (c - b);
    if (Math.abs(half) <= tol || gb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(ga) > Math.abs(gb)) {
      // inverse quadratic interpolation, or secant when only two points are distinct
      const s = gb / ga;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * half * s;
        q = 1 - s;
      } else {
        const qa = ga / gc;
        const r = gb / gc;
        p = s * (2 * half * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * half * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = half;
        e = d;
      }
    } else {
      d = half;
      e = d;
    }
    a = b;
    ga = gb;
    b += Math.abs(d) > tol ? d : half > 0 ? tol : -tol;
    gb = g(b);
  }
  return b;
}
