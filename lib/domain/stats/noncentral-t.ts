/**
 * The noncentral t distribution, for the power of a t test. The series is Guenther's (1978) as
 * arranged by Lenth (1989, Applied Statistics algorithm AS 243), the same published algorithm behind
 * R's pt(t, df, ncp): a Poisson-weighted sum of incomplete beta functions, run until the bound on the
 * remaining terms is below 1e-12. The beta and normal functions are this engine's own accurate ones.
 * jstat's noncentral t stops after a fixed count and is not used (see distributions.ts on jstat).
 */
import { StatsError } from "./errors";
import { normalCdf } from "./distributions";
import { incompleteBetaTails, logGamma } from "./special-functions";

const MAX_TERMS = 1000;
const ERROR_BOUND = 1e-12;
const SQRT_2_OVER_PI = 0.797884560802865355879892119869;
const LOG_SQRT_PI = 0.572364942924700087071713675677;

/** P(T <= t) for T noncentral t with df degrees of freedom and noncentrality ncp. */
export function noncentralTCdf(t: number, df: number, ncp: number): number {
  if (!(df > 0) || !Number.isFinite(ncp) || Number.isNaN(t)) {
    throw new StatsError("INVALID_ARGUMENT", `The noncentral t needs positive degrees of freedom and a finite noncentrality (got df ${df}, noncentrality ${ncp}).`, { t, df, ncp });
  }
  if (t === Infinity) return 1;
  if (t === -Infinity) return 0;
  // P(T <= t | ncp) = 1 - P(T <= -t | -ncp): the series runs on t >= 0
  const negative = t < 0;
  const tt = negative ? -t : t;
  const delta = negative ? -ncp : ncp;
  // Where the series' first Poisson weight underflows or df is huge, AS 243 (and R) use the normal
  // approximation of Abramowitz & Stegun 26.7.10; its error there is far below what a power needs.
  if (df > 4e5 || delta * delta > 2 * Math.LN2 * 1021) {
    const s = 1 / (4 * df);
    const z = (tt * (1 - s) - delta) / Math.sqrt(1 + tt * tt * 2 * s);
    return negative ? normalCdf(-z) : normalCdf(z);
  }
  const upperOfSeries = lowerSeries(tt, df, delta);
  const value = negative ? 1 - upperOfSeries : upperOfSeries;
  return Math.min(1, Math.max(0, value));
}

/** AS 243: P(T <= t) for t >= 0. */
function lowerSeries(t: number, df: number, delta: number): number {
  let total = 0;
  const t2 = t * t;
  const x = t2 / (t2 + df);
  if (x > 0) {
    const lambda = delta * delta;
    let p = 0.5 * Math.exp(-0.5 * lambda);
    let q = SQRT_2_OVER_PI * p * delta;
    let s = 0.5 - p;
    if (s < 1e-7) s = -0.5 * Math.expm1(-0.5 * lambda);
    let a = 0.5;
    const b = 0.5 * df;
    const rxb = Math.pow(df / (t2 + df), b);
    const logBetaHalf = LOG_SQRT_PI + logGamma(b) - logGamma(0.5 + b);
    let xodd = incompleteBetaTails(a, b, x, df / (t2 + df)).lower;
    let godd = 2 * rxb * Math.exp(a * Math.log(x) - logBetaHalf);
    let xeven = b * x < 2.220446049250313e-16 ? b * x : 1 - rxb;
    let geven = b * x * rxb;
    total = p * xodd + q * xeven;
    let converged = false;
    for (let it = 1; it <= MAX_TERMS; it++) {
      a += 1;
      xodd -= godd;
      xeven -= geven;
      godd *= (x * (a + b - 1)) / a;
      geven *= (x * (a + b - 0.5)) / (a + 0.5);
      p *= lambda / (2 * it);
      q *= lambda / (2 * it + 1);
      total += p * xodd + q * xeven;
      s -= p;
      if (s < -1e-10 || (s <= 0 && it > 1) || Math.abs(2 * s * (xodd - godd)) < ERROR_BOUND) {
        converged = true;
        break;
      }
    }
    if (!converged) {
      throw new StatsError("NOT_ESTIMABLE", "The power could not be computed to full accuracy for these numbers; try a smaller difference or fewer plots.", { t, df, delta });
    }
  }
  return total + normalCdf(-delta);
}
