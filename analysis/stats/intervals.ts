import { betaQuantile, gammaQuantile, normalCriticalValue } from "./distributions";

export interface Interval {
  estimate: number;
  lower: number;
  upper: number;
}

export const DEFAULT_CONFIDENCE = 0.95;

/**
 * Exact (Garwood) interval for a Poisson rate: the bounds are gamma
 * quantiles, i.e. chi-square quantiles halved, so it holds its coverage even
 * for the handful of events a small group produces.
 */
export function poissonRateInterval(events: number, exposure: number, level = DEFAULT_CONFIDENCE): Interval {
  if (!(exposure > 0)) return { estimate: NaN, lower: NaN, upper: NaN };
  const alpha = 1 - level;
  const lower = events === 0 ? 0 : gammaQuantile(alpha / 2, events);
  const upper = gammaQuantile(1 - alpha / 2, events + 1);
  return { estimate: events / exposure, lower: lower / exposure, upper: upper / exposure };
}

/** Wilson score interval for a proportion (Newcombe 1998, method 3). */
export function wilsonInterval(successes: number, trials: number, level = DEFAULT_CONFIDENCE): Interval {
  if (!(trials > 0)) return { estimate: NaN, lower: NaN, upper: NaN };
  const z = normalCriticalValue(level);
  const p = successes / trials;
  const z2 = z * z;
  const centre = p + z2 / (2 * trials);
  const spread = z * Math.sqrt((p * (1 - p) + z2 / (4 * trials)) / trials);
  const denominator = 1 + z2 / trials;
  return {
    estimate: p,
    lower: Math.max(0, (centre - spread) / denominator),
    upper: Math.min(1, (centre + spread) / denominator),
  };
}

/** Clopper-Pearson exact interval for a binomial proportion. */
export function clopperPearsonInterval(successes: number, trials: number, level = DEFAULT_CONFIDENCE): Interval {
  if (!(trials > 0)) return { estimate: NaN, lower: NaN, upper: NaN };
  const alpha = 1 - level;
  return {
    estimate: successes / trials,
    lower: successes === 0 ? 0 : betaQuantile(alpha / 2, successes, trials - successes + 1),
    upper: successes === trials ? 1 : betaQuantile(1 - alpha / 2, successes + 1, trials - successes),
  };
}

export interface RateRatio extends Interval {
  method: "conditional-exact";
}

/**
 * Ratio of two Poisson rates with the conditional exact interval: given the
 * total count, the group's share of events is binomial with
 * p = RR*Ta / (RR*Ta + Tb), so a Clopper-Pearson interval for p maps onto RR.
 *
 * Chosen over the log-normal approximation because route-book groups are
 * small: a group with zero events, or a rest-of-book with zero, still gets a
 * valid interval (lower bound 0, or upper bound infinite), where the log
 * method breaks down, and coverage stays at or above the nominal level.
 */
export function rateRatioInterval(
  groupEvents: number,
  groupExposure: number,
  otherEvents: number,
  otherExposure: number,
  level = DEFAULT_CONFIDENCE,
): RateRatio {
  const method = "conditional-exact" as const;
  if (!(groupExposure > 0 && otherExposure > 0)) return { estimate: NaN, lower: NaN, upper: NaN, method };
  const total = groupEvents + otherEvents;
  const exposureRatio = otherExposure / groupExposure;
  const estimate = otherEvents === 0 ? (groupEvents === 0 ? NaN : Infinity) : (groupEvents / groupExposure) / (otherEvents / otherExposure);
  if (total === 0) return { estimate, lower: 0, upper: Infinity, method };
  const share = clopperPearsonInterval(groupEvents, total, level);
  const toRatio = (p: number) => (p >= 1 ? Infinity : (p / (1 - p)) * exposureRatio);
  return { estimate, lower: toRatio(share.lower), upper: toRatio(share.upper), method };
}
