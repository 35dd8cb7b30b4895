import { gammaln } from "simple-statistics";

/**
 * Distribution functions that simple-statistics lacks or computes only from
 * a lookup table. Quantiles are found by bracketing and bisection on the CDF:
 * slower than Newton steps but cannot diverge, and each CDF here is accurate
 * to about 1e-14, which is far more than the two-decimal intervals shown.
 */

const EPSILON = 1e-15;
const TINY = 1e-300;
const MAX_ITERATIONS = 10_000;

/**
 * Standard normal quantile, Wichura's algorithm AS 241 (PPND16), accurate to
 * about 1e-16. simple-statistics' probit is only good to about 3 decimals.
 */
/* eslint-disable no-loss-of-precision -- AS 241's coefficients are kept digit for digit as published (20 significant digits), so they can be checked against the paper. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) {
    if (p === 0) return -Infinity;
    if (p === 1) return Infinity;
    return NaN;
  }
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (
      (q *
        (((((((r * 2509.0809287301226727 + 33430.575583588128105) * r + 67265.770927008700853) * r +
          45921.953931549871457) * r + 13731.693765509461125) * r + 1971.5909503065514427) * r +
          133.14166789178437745) * r + 3.387132872796366608)) /
      (((((((r * 5226.495278852545925 + 28729.085735721942674) * r + 39307.89580009271061) * r +
        21213.794301586595867) * r + 5394.1960214247511077) * r + 687.1870074920579083) * r +
        42.313330701600911252) * r + 1)
    );
  }
  let r = q < 0 ? p : 1 - p;
  r = Math.sqrt(-Math.log(r));
  let value: number;
  if (r <= 5) {
    r -= 1.6;
    value =
      (((((((r * 7.7454501427834140764e-4 + 0.0227238449892691845833) * r + 0.24178072517745061177) * r +
        1.27045825245236838258) * r + 3.64784832476320460504) * r + 5.7694972214606914055) * r +
        4.6303378461565452959) * r + 1.42343711074968357734) /
      (((((((r * 1.05075007164441684324e-9 + 5.475938084995344946e-4) * r + 0.0151986665636164571966) * r +
        0.14810397642748007459) * r + 0.68976733498510000455) * r + 1.6763848301838038494) * r +
        2.05319162663775882187) * r + 1);
  } else {
    r -= 5;
    value =
      (((((((r * 2.01033439929228813265e-7 + 2.71155556874348757815e-5) * r + 0.0012426609473880784386) * r +
        0.026532189526576123093) * r + 0.29656057182850489123) * r + 1.7848265399172913358) * r +
        5.4637849111641143699) * r + 6.6579046435011037772) /
      (((((((r * 2.04426310338993978564e-15 + 1.4215117583164458887e-7) * r + 1.8463183175100546818e-5) * r +
        7.868691311456132591e-4) * r + 0.0148753612908506148525) * r + 0.13692988092273580531) * r +
        0.59983220655588793769) * r + 1);
  }
  return q < 0 ? -value : value;
}
/* eslint-enable no-loss-of-precision */

/** Two-sided critical value, e.g. 1.959964 for a 95 % interval. */
export function normalCriticalValue(level: number): number {
  return normalQuantile(1 - (1 - level) / 2);
}

/** Standard normal CDF through the complementary error function (W. J. Cody's rational fits are overkill here). */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

function erfc(x: number): number {
  // erfc(x) = Q(1/2, x^2) for x >= 0
  if (x >= 0) return regularizedGammaQ(0.5, x * x);
  return 2 - regularizedGammaQ(0.5, x * x);
}

/** Lower regularized incomplete gamma P(a, x) = gamma(a, x) / Gamma(a). */
export function regularizedGammaP(a: number, x: number): number {
  if (!(a > 0) || x < 0 || Number.isNaN(x)) return NaN;
  if (x === 0) return 0;
  if (x === Infinity) return 1;
  return x < a + 1 ? gammaSeries(a, x) : 1 - gammaContinuedFraction(a, x);
}

/** Upper regularized incomplete gamma Q(a, x) = 1 - P(a, x), computed without cancellation. */
export function regularizedGammaQ(a: number, x: number): number {
  if (!(a > 0) || x < 0 || Number.isNaN(x)) return NaN;
  if (x === 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - gammaSeries(a, x) : gammaContinuedFraction(a, x);
}

function gammaSeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  let ap = a;
  for (let n = 0; n < MAX_ITERATIONS; n++) {
    ap += 1;
    term *= x / ap;
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPSILON) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - gammaln(a));
}

/** Modified Lentz evaluation of the continued fraction for Q(a, x). */
function gammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPSILON) break;
  }
  return Math.exp(-x + a * Math.log(x) - gammaln(a)) * h;
}

/**
 * Finds x in [low, high] with f(x) = target for a non-decreasing f, growing
 * the upper end until it brackets the target.
 */
function solveIncreasing(f: (x: number) => number, target: number, low: number, high: number): number {
  let lo = low;
  let hi = high;
  for (let i = 0; i < 2000 && f(hi) < target; i++) {
    lo = hi;
    hi *= 2;
  }
  for (let i = 0; i < 400; i++) {
    const mid = (lo + hi) / 2;
    if (mid === lo || mid === hi) break;
    if (f(mid) < target) lo = mid;
    else hi = mid;
    if (hi - lo <= 1e-15 * Math.max(1, Math.abs(hi))) break;
  }
  return (lo + hi) / 2;
}

/**
 * Quantiles already worked out, by their arguments. A route book's groups share
 * a few event counts (and the rest of the book the same total), so a thousand
 * groups' exact intervals ask for a few dozen distinct quantiles, each a
 * bisection of hundreds of steps. Emptied when full, so it stays small.
 */
const QUANTILES_KEPT = 4096;
const quantiles = new Map<string, number>();

function remembered(key: string, work: () => number): number {
  let value = quantiles.get(key);
  if (value === undefined) {
    if (quantiles.size >= QUANTILES_KEPT) quantiles.clear();
    quantiles.set(key, (value = work()));
  }
  return value;
}

/** Quantile of the gamma distribution with the given shape and unit scale. */
export function gammaQuantile(p: number, shape: number): number {
  return remembered(`gamma ${p} ${shape}`, () => gammaQuantileOf(p, shape));
}

function gammaQuantileOf(p: number, shape: number): number {
  if (!(shape > 0) || !(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  // Work on the smaller tail so that upper quantiles keep their precision.
  if (p > 0.5) {
    const target = 1 - p;
    return solveIncreasing((x) => -regularizedGammaQ(shape, x), -target, 0, Math.max(1, shape * 2));
  }
  return solveIncreasing((x) => regularizedGammaP(shape, x), p, 0, Math.max(1, shape * 2));
}

export function chiSquareQuantile(p: number, degreesOfFreedom: number): number {
  return 2 * gammaQuantile(p, degreesOfFreedom / 2);
}

/** P(X > x) for a chi-square variable. */
export function chiSquareSurvival(x: number, degreesOfFreedom: number): number {
  if (x <= 0) return 1;
  return regularizedGammaQ(degreesOfFreedom / 2, x / 2);
}

/** Regularized incomplete beta I_x(a, b). */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0 && b > 0) || Number.isNaN(x)) return NaN;
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const logFront = gammaln(a + b) - gammaln(a) - gammaln(b) + a * Math.log(x) + b * Math.log1p(-x);
  const front = Math.exp(logFront);
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(x, a, b)) / a;
  return 1 - (front * betaContinuedFraction(1 - x, b, a)) / b;
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m < MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPSILON) break;
  }
  return h;
}

/** Quantile of the beta distribution. */
export function betaQuantile(p: number, a: number, b: number): number {
  return remembered(`beta ${p} ${a} ${b}`, () => betaQuantileOf(p, a, b));
}

function betaQuantileOf(p: number, a: number, b: number): number {
  if (!(a > 0 && b > 0) || !(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  // Search the thinner tail near 0, where doubles are dense.
  if (p > 0.5) return 1 - lowerBetaQuantile(1 - p, b, a);
  return lowerBetaQuantile(p, a, b);
}

function lowerBetaQuantile(p: number, a: number, b: number): number {
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid === lo || mid === hi) break;
    if (regularizedBeta(mid, a, b) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
