/**
 * Special functions behind the distribution functions: log-gamma, the error function and the
 * regularized incomplete beta and gamma functions. Each tail is computed directly (never as
 * 1 - the other tail), so tiny p-values keep their relative accuracy instead of underflowing.
 */

const LOG_SQRT_2PI = 0.91893853320467274178; // ln(sqrt(2 pi))
const DOUBLE_EPS = 2.220446049250313e-16;
const TINY = 1e-300;
const MAX_CONTINUED_FRACTION_TERMS = 100_000;

/**
 * Stirling-series remainder: delta(x) = lnGamma(x) - [(x - 0.5) ln x - x + ln sqrt(2 pi)], x > 0.
 * Keeping it separate lets the beta and gamma prefactors cancel the large Stirling terms
 * analytically, which is what keeps p-values accurate at large degrees of freedom.
 */
export function stirlingRemainder(x: number): number {
  if (!(x > 0)) return Number.NaN;
  let shift = 0;
  // delta(x) = delta(x + 1) + (x + 0.5) ln(1 + 1/x) - 1: move x up to where the asymptotic series converges fast
  while (x < 10) {
    shift += (x + 0.5) * Math.log1p(1 / x) - 1;
    x += 1;
  }
  const inv = 1 / x;
  const inv2 = inv * inv;
  // Bernoulli-number coefficients B_2k / (2k (2k - 1)), k = 1..8 (Abramowitz & Stegun 6.1.40)
  const series =
    inv *
    (1 / 12 +
      inv2 *
        (-1 / 360 +
          inv2 *
            (1 / 1260 +
              inv2 *
                (-1 / 1680 +
                  inv2 * (1 / 1188 + inv2 * (-691 / 360360 + inv2 * (1 / 156 + inv2 * (-3617 / 122400))))))));
  return series + shift;
}

/** Natural log of the gamma function for x > 0 (absolute error about 1e-15 near x = 1 and 2). */
export function logGamma(x: number): number {
  if (!(x > 0)) return Number.NaN;
  if (x < 10) {
    // Gamma(x) = Gamma(x + n) / (x (x + 1) ... (x + n - 1))
    let product = 1;
    let shifted = x;
    while (shifted < 10) {
      product *= shifted;
      shifted += 1;
    }
    return logGamma(shifted) - Math.log(product);
  }
  return (x - 0.5) * Math.log(x) - x + LOG_SQRT_2PI + stirlingRemainder(x);
}

/** ln B(a, b) = lnGamma(a) + lnGamma(b) - lnGamma(a + b). */
export function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

/** log(1 + t) - t without cancellation for small t (t > -1). */
export function log1pMinusX(t: number): number {
  if (Math.abs(t) < 0.25) {
    // alternating series -t^2/2 + t^3/3 - ..., fine because |t| < 1/4
    let term = t * t;
    let sum = 0;
    for (let k = 2; k < 60; k++) {
      const contribution = term / k;
      sum += k % 2 === 0 ? -contribution : contribution;
      if (Math.abs(contribution) < 1e-18 * Math.abs(sum)) break;
      term *= t;
    }
    return sum;
  }
  return Math.log1p(t) - t;
}

// W. J. Cody (1969), "Rational Chebyshev approximations for the error function",
// Mathematics of Computation 23, 631-637: coefficients of the three intervals.
const CODY_A = [3.1611237438705656, 113.86415415105016, 377.48523768530202, 3209.3775891384695, 0.18577770618460315];
const CODY_B = [23.601290952344122, 244.02463793444417, 1282.6165260773723, 2844.2368334391706];
const CODY_C = [
  0.56418849698867009, 8.8831497943883759, 66.119190637141630, 298.63513819740013, 881.95222124176909,
  1712.0476126340706, 2051.0783778260715, 1230.3393547979973, 2.1531153547440385e-8,
];
const CODY_D = [
  15.744926110709835, 117.69395089131250, 537.18110186200986, 1621.3895745666902, 3290.7992357334596,
  4362.6190901432472, 3439.3676741437216, 1230.3393548037494,
];
const CODY_P = [
  0.30532663496123234, 0.36034489994980444, 0.12578172611122925, 0.016083785148742277, 6.5874916152983780e-4,
  0.016315387137302098,
];
const CODY_Q = [2.5685201922898224, 1.8729528499234605, 0.52790510295142841, 0.060518341312441319, 0.0023352049762686918];
const INV_SQRT_PI = 0.56418958354775628695;

/** exp(-y^2) with the argument split so the rounding of y^2 does not cost relative accuracy (Cody). */
function expNegSquare(y: number): number {
  const head = Math.trunc(y * 16) / 16;
  const tail = (y - head) * (y + head);
  return Math.exp(-head * head) * Math.exp(-tail);
}

/** Complementary error function erfc(x) with full relative accuracy in the upper tail (Cody 1969). */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return Number.NaN;
  const y = Math.abs(x);
  let upper: number;
  if (y <= 0.46875) {
    const ysq = y * y;
    let num = CODY_A[4] * ysq;
    let den = ysq;
    for (let i = 0; i < 3; i++) {
      num = (num + CODY_A[i]) * ysq;
      den = (den + CODY_B[i]) * ysq;
    }
    const erfValue = (x * (num + CODY_A[3])) / (den + CODY_B[3]);
    return 1 - erfValue;
  } else if (y <= 4) {
    let num = CODY_C[8] * y;
    let den = y;
    for (let i = 0; i < 7; i++) {
      num = (num + CODY_C[i]) * y;
      den = (den + CODY_D[i]) * y;
    }
    upper = ((num + CODY_C[7]) / (den + CODY_D[7])) * expNegSquare(y);
  } else if (y >= 27.3) {
    upper = 0; // below the smallest double
  } else {
    const inv2 = 1 / (y * y);
    let num = CODY_P[5] * inv2;
    let den = inv2;
    for (let i = 0; i < 4; i++) {
      num = (num + CODY_P[i]) * inv2;
      den = (den + CODY_Q[i]) * inv2;
    }
    const r = (inv2 * (num + CODY_P[4])) / (den + CODY_Q[4]);
    upper = ((INV_SQRT_PI - r) / y) * expNegSquare(y);
  }
  return x < 0 ? 2 - upper : upper;
}

/**
 * x^a y^b / B(a, b) with y = 1 - x supplied by the caller (so it is not rounded through 1 - x).
 * Written as sqrt(ab / (2 pi (a + b))) exp(a ln(x/x0) + b ln(y/y0) + delta terms), x0 = a/(a+b),
 * so the huge Stirling terms of the three log-gammas cancel analytically (DiDonato & Morris 1992,
 * ACM TOMS 18, 360-373, function BRCOMP, idea only).
 */
function betaPrefactor(a: number, b: number, x: number, y: number): number {
  if (x === 0 || y === 0) return 0;
  const sum = a + b;
  const exponent =
    a * Math.log((x * sum) / a) +
    b * Math.log((y * sum) / b) +
    stirlingRemainder(sum) -
    stirlingRemainder(a) -
    stirlingRemainder(b);
  return Math.sqrt((a * b) / (2 * Math.PI * sum)) * Math.exp(exponent);
}

/**
 * Continued fraction of I_x(a, b) (Abramowitz & Stegun 26.5.8) evaluated by the modified Lentz
 * method (Lentz 1976; Thompson & Barnett 1986). Converges quickly for x < (a + 1) / (a + b + 2).
 */
function betaContinuedFraction(a: number, b: number, x: number): number {
  const sum = a + b;
  let c = 1;
  let d = 1 - (sum * x) / (a + 1);
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let result = d;
  for (let m = 1; m <= MAX_CONTINUED_FRACTION_TERMS; m++) {
    const m2 = 2 * m;
    // even step
    let coefficient = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + coefficient * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + coefficient / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    result *= d * c;
    // odd step
    coefficient = (-(a + m) * (sum + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + coefficient * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + coefficient / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    result *= delta;
    if (Math.abs(delta - 1) < DOUBLE_EPS) break;
  }
  return result;
}

/**
 * Regularized incomplete beta I_x(a, b) and its complement, both computed without 1 - p
 * cancellation. `x` and `y = 1 - x` are passed separately so callers can form y exactly
 * (e.g. d2 / (d1 F + d2) for the F distribution).
 */
export function incompleteBetaTails(a: number, b: number, x: number, y: number): { lower: number; upper: number } {
  if (!(a > 0) || !(b > 0) || !(x >= 0) || !(y >= 0)) return { lower: Number.NaN, upper: Number.NaN };
  if (x === 0) return { lower: 0, upper: 1 };
  if (y === 0) return { lower: 1, upper: 0 };
  if (x < (a + 1) / (a + b + 2)) {
    const lower = (betaPrefactor(a, b, x, y) * betaContinuedFraction(a, b, x)) / a;
    return { lower, upper: 1 - lower };
  }
  const upper = (betaPrefactor(b, a, y, x) * betaContinuedFraction(b, a, y)) / b;
  return { lower: 1 - upper, upper };
}

/** x^a e^-x / Gamma(a), with the Stirling terms cancelled (same idea as betaPrefactor). */
function gammaPrefactor(a: number, x: number): number {
  if (x === 0) return 0;
  if (a < 10) return Math.exp(a * Math.log(x) - x - logGamma(a));
  const t = (x - a) / a;
  return Math.sqrt(a / (2 * Math.PI)) * Math.exp(a * log1pMinusX(t) - stirlingRemainder(a));
}

/**
 * Regularized incomplete gamma P(a, x) and Q(a, x) = 1 - P(a, x), each tail computed directly:
 * power series for x < a + 1, Lentz continued fraction (Abramowitz & Stegun 6.5.31) otherwise.
 */
export function incompleteGammaTails(a: number, x: number): { lower: number; upper: number } {
  if (!(a > 0) || !(x >= 0)) return { lower: Number.NaN, upper: Number.NaN };
  if (x === 0) return { lower: 0, upper: 1 };
  if (x === Infinity) return { lower: 1, upper: 0 };
  const prefactor = gammaPrefactor(a, x);
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n <= MAX_CONTINUED_FRACTION_TERMS; n++) {
      term *= x / (a + n);
      sum += term;
      if (term < sum * DOUBLE_EPS) break;
    }
    const lower = prefactor * sum;
    return { lower, upper: 1 - lower };
  }
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let result = d;
  for (let i = 1; i <= MAX_CONTINUED_FRACTION_TERMS; i++) {
    const coefficient = -i * (i - a);
    b += 2;
    d = coefficient * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + coefficient / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    result *= delta;
    if (Math.abs(delta - 1) < DOUBLE_EPS) break;
  }
  const upper = prefactor * result;
  return { lower: 1 - upper, upper };
}
