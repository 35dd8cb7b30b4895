import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { cumulativeStdNormalProbability } from "simple-statistics";
import {
  betaQuantile,
  chiSquareQuantile,
  chiSquareSurvival,
  normalCdf,
  normalQuantile,
  regularizedBeta,
  regularizedGammaP,
  regularizedGammaQ,
} from "./distributions";
import { clopperPearsonInterval, poissonRateInterval, rateRatioInterval, wilsonInterval } from "./intervals";
import { kaplanMeier, logRankTest, survivalAt, type SurvivalObservation } from "./survival";
import { mannWhitney, wilcoxonSignedRank } from "./rank-tests";

describe("distribution functions", () => {
  it("normal quantile inverts the normal CDF to machine precision", () => {
    // 1.959964 is the standard two-sided 95 % critical value (recalled from standard tables).
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    fc.assert(fc.property(fc.double({ min: 1e-12, max: 1 - 1e-9, noNaN: true }), (p) => {
      expect(Math.abs(normalCdf(normalQuantile(p)) / p - 1)).toBeLessThan(1e-9);
    }));
  });

  it("normal CDF agrees with simple-statistics' table to its four decimals", () => {
    for (const z of [-2.5, -1, 0, 0.5, 1.96, 3]) {
      expect(Math.abs(normalCdf(z) - cumulativeStdNormalProbability(z))).toBeLessThan(1e-4);
    }
  });

  it("incomplete gamma: P + Q = 1, exponential and chi-square identities", () => {
    fc.assert(fc.property(fc.double({ min: 0.05, max: 500, noNaN: true }), fc.double({ min: 0, max: 800, noNaN: true }), (a, x) => {
      expect(regularizedGammaP(a, x) + regularizedGammaQ(a, x)).toBeCloseTo(1, 12);
    }));
    // Derived: P(1, x) = 1 - e^-x.
    expect(regularizedGammaP(1, 2)).toBeCloseTo(1 - Math.exp(-2), 14);
    // Derived: chi-square with 2 df is exponential with mean 2, so its 95 % quantile is 2 ln 20.
    expect(chiSquareQuantile(0.95, 2)).toBeCloseTo(2 * Math.log(20), 10);
    // Derived: a 1-df chi-square is a squared normal, so its 95 % quantile is 1.959964^2.
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(normalQuantile(0.975) ** 2, 9);
    expect(chiSquareSurvival(normalQuantile(0.975) ** 2, 1)).toBeCloseTo(0.05, 12);
  });

  it("chi-square quantiles invert the CDF over a wide range", () => {
    fc.assert(fc.property(fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true }), fc.integer({ min: 1, max: 2000 }), (p, df) => {
      const x = chiSquareQuantile(p, df);
      expect(regularizedGammaP(df / 2, x / 2)).toBeCloseTo(p, 9);
    }));
  });

  it("incomplete beta and its quantile", () => {
    // Derived: I_x(1, b) = 1 - (1 - x)^b and I_x(a, 1) = x^a.
    expect(regularizedBeta(0.3, 1, 4)).toBeCloseTo(1 - 0.7 ** 4, 14);
    expect(regularizedBeta(0.3, 3, 1)).toBeCloseTo(0.027, 14);
    fc.assert(fc.property(fc.double({ min: 0.001, max: 0.999, noNaN: true }), fc.double({ min: 1, max: 300, noNaN: true }), fc.double({ min: 1, max: 300, noNaN: true }), (p, a, b) => {
      // Shapes of at least 1, as in every binomial interval; with smaller shapes the quantile
      // can sit closer to 1 than doubles resolve, and no search can round-trip it.
      expect(regularizedBeta(betaQuantile(p, a, b), a, b)).toBeCloseTo(p, 7);
    }));
  });
});

describe("exact Poisson interval", () => {
  // A general statistics package's documented example, recomputed: 14 events in 400
  // person-years, rate 0.035, 95 % interval 0.019135 to 0.058724; tolerance 0.000001.
  it("14 events in 400 pool-years", () => {
    const r = poissonRateInterval(14, 400);
    expect(r.estimate).toBe(0.035);
    expect(Math.abs(r.lower - 0.019135)).toBeLessThanOrEqual(1e-6);
    expect(Math.abs(r.upper - 0.058724)).toBeLessThanOrEqual(1e-6);
  });

  // Derived: with no events the upper bound is -ln(0.025) per unit exposure.
  it("zero events", () => {
    const r = poissonRateInterval(0, 10);
    expect(r.lower).toBe(0);
    expect(r.upper).toBeCloseTo(-Math.log(0.025) / 10, 10);
  });

  it("bounds contain the estimate and rates scale with time", () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 5000 }), fc.double({ min: 0.01, max: 1e4, noNaN: true }), fc.double({ min: 0.1, max: 100, noNaN: true }), (k, t, scale) => {
      const r = poissonRateInterval(k, t);
      expect(r.lower).toBeLessThanOrEqual(r.estimate * (1 + 1e-12));
      expect(r.upper).toBeGreaterThanOrEqual(r.estimate);
      const scaled = poissonRateInterval(k, t * scale);
      expect(scaled.estimate * scale).toBeCloseTo(r.estimate, 9);
      expect(scaled.upper * scale / r.upper).toBeCloseTo(1, 9);
    }));
  });
});

describe("Wilson interval", () => {
  // Newcombe 1998 (Stat Med 17:857), table I, recomputed; tolerance 0.0001.
  it("81/263 and 15/148", () => {
    const a = wilsonInterval(81, 263);
    expect(Math.abs(a.lower - 0.2553)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(a.upper - 0.3662)).toBeLessThanOrEqual(1e-4);
    const b = wilsonInterval(15, 148);
    expect(Math.abs(b.lower - 0.0624)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(b.upper - 0.1605)).toBeLessThanOrEqual(1e-4);
  });

  it("bounds contain the estimate and stay in [0, 1]", () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 10_000 }), fc.double({ min: 0, max: 1, noNaN: true }), (n, share) => {
      const k = Math.round(share * n);
      const w = wilsonInterval(k, n);
      expect(w.lower).toBeGreaterThanOrEqual(0);
      expect(w.upper).toBeLessThanOrEqual(1);
      expect(w.lower).toBeLessThanOrEqual(w.estimate + 1e-12);
      expect(w.upper).toBeGreaterThanOrEqual(w.estimate - 1e-12);
    }));
  });
});

describe("Clopper-Pearson and rate ratio", () => {
  // Derived closed forms: 0 of n gives upper 1 - 0.025^(1/n); n of n gives lower 0.025^(1/n).
  it("closed forms at the edges", () => {
    expect(clopperPearsonInterval(0, 20).upper).toBeCloseTo(1 - 0.025 ** (1 / 20), 10);
    expect(clopperPearsonInterval(20, 20).lower).toBeCloseTo(0.025 ** (1 / 20), 10);
  });

  it("equal rates give a ratio of 1 inside its interval; zero counts stay valid", () => {
    const even = rateRatioInterval(10, 50, 40, 200);
    expect(even.estimate).toBeCloseTo(1, 12);
    expect(even.lower).toBeLessThan(1);
    expect(even.upper).toBeGreaterThan(1);
    const none = rateRatioInterval(0, 10, 30, 300);
    expect(none).toMatchObject({ estimate: 0, lower: 0 });
    expect(none.upper).toBeGreaterThan(0);
    expect(rateRatioInterval(5, 10, 0, 300).upper).toBe(Infinity);
  });

  it("the ratio's interval contains the estimate and is invariant to the time unit", () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 300 }), fc.integer({ min: 1, max: 300 }), fc.double({ min: 0.5, max: 500, noNaN: true }), fc.double({ min: 0.5, max: 500, noNaN: true }), fc.double({ min: 0.01, max: 100, noNaN: true }), (a, b, ta, tb, unit) => {
      const rr = rateRatioInterval(a, ta, b, tb);
      expect(rr.lower).toBeLessThanOrEqual(rr.estimate * (1 + 1e-9));
      expect(rr.upper).toBeGreaterThanOrEqual(rr.estimate * (1 - 1e-9));
      const rescaled = rateRatioInterval(a, ta * unit, b, tb * unit);
      expect(rescaled.estimate).toBeCloseTo(rr.estimate, 9);
      if (rr.upper < 1e6) expect(rescaled.upper / rr.upper).toBeCloseTo(1, 9);
    }));
  });
});

// Freireich et al. 1963 (Blood 21:699), 6-MP arm, weeks in remission; false = censored ("+").
const sixMp: SurvivalObservation[] = [
  ...[6, 6, 6, 7, 10, 13, 16, 22, 23].map((time) => ({ time, event: true })),
  ...[6, 9, 10, 11, 17, 19, 20, 25, 32, 32, 34, 35].map((time) => ({ time, event: false })),
];
// Same trial, placebo arm (no censoring), as printed in the standard survival textbooks.
const placebo: SurvivalObservation[] = [1, 1, 2, 2, 3, 4, 4, 5, 5, 8, 8, 8, 8, 11, 11, 12, 12, 15, 17, 22, 23].map((time) => ({ time, event: true }));

describe("Kaplan-Meier", () => {
  // Freireich 1963 6-MP data, recomputed from the published data (same as the standard
  // survival-analysis textbooks); tolerance 0.0001.
  it("reproduces S(t), the median and Greenwood standard errors on the 6-MP data", () => {
    const curve = kaplanMeier(sixMp);
    const expected: Array<[number, number]> = [[6, 0.8571], [7, 0.8067], [10, 0.7529], [13, 0.6902], [16, 0.6275], [22, 0.5378], [23, 0.4482]];
    for (const [t, s] of expected) expect(Math.abs(survivalAt(curve, t) - s)).toBeLessThanOrEqual(1e-4);
    expect(curve.median).toBe(23);
    const at = (t: number) => curve.steps.find((s) => s.time === t)!;
    expect(Math.abs(at(6).standardError - 0.0764)).toBeLessThanOrEqual(1e-4);
    expect(Math.abs(at(23).standardError - 0.1346)).toBeLessThanOrEqual(1e-4);
    expect(curve.events).toBe(9);
    expect(at(6)).toMatchObject({ atRisk: 21, events: 3, censored: 1 });
  });

  it("puts the median's limits around the median, the lower one where the lower band reaches one half", () => {
    const curve = kaplanMeier(placebo);
    // Placebo arm: S falls to 0.5 at 8 weeks; the bands cross one half before and after it.
    expect(curve.median).toBe(8);
    expect(curve.medianLower).not.toBeNull();
    expect(curve.medianUpper).not.toBeNull();
    expect(curve.medianLower!).toBeLessThan(curve.median!);
    expect(curve.medianUpper!).toBeGreaterThan(curve.median!);
    const firstBelowHalf = (band: "lower" | "upper") => curve.steps.find((s) => s[band] <= 0.5)!.time;
    expect([curve.medianLower, curve.medianUpper]).toEqual([firstBelowHalf("lower"), firstBelowHalf("upper")]);
  });

  it("plain intervals are S +/- 1.96 SE; log-log intervals contain S inside [0, 1]", () => {
    const plain = kaplanMeier(sixMp, { interval: "plain" });
    const step = plain.steps.find((s) => s.time === 23)!;
    expect(step.upper - step.survival).toBeCloseTo(normalQuantile(0.975) * step.standardError, 10);
    fc.assert(fc.property(fc.array(fc.record({ time: fc.integer({ min: 0, max: 30 }), event: fc.boolean() }), { minLength: 1, maxLength: 60 }), (obs) => {
      for (const s of kaplanMeier(obs).steps) {
        expect(s.lower).toBeGreaterThanOrEqual(0);
        expect(s.upper).toBeLessThanOrEqual(1);
        expect(s.lower).toBeLessThanOrEqual(s.survival + 1e-12);
        expect(s.upper).toBeGreaterThanOrEqual(s.survival - 1e-12);
      }
    }));
  });

  it("without censoring the curve is the empirical survival function", () => {
    const curve = kaplanMeier(placebo);
    expect(survivalAt(curve, 8)).toBeCloseTo(8 / 21, 12);
    expect(curve.median).toBe(8);
  });

  // Log-rank, 6-MP vs placebo: chi-square 16.8 on 1 df (value recalled from the standard
  // survival-analysis textbooks' treatment of these data, not read here); tolerance 0.05.
  // Observed/expected 9 vs 19.25 for 6-MP is the same recalled source.
  it("log-rank test separates 6-MP from placebo", () => {
    const r = logRankTest(sixMp, placebo);
    expect(Math.abs(r.chiSquare - 16.8)).toBeLessThanOrEqual(0.05);
    expect(r.observed).toEqual([9, 21]);
    expect(r.expected[0]).toBeCloseTo(19.25, 2);
    expect(r.pValue).toBeLessThan(1e-4);
    expect(logRankTest(sixMp, sixMp).chiSquare).toBeCloseTo(0, 12);
  });
});

describe("rank tests", () => {
  // Hollander and Wolfe 1973 data as in R's wilcox.test examples; V = 40, one-sided
  // p = 0.01953 (derived with the exact distribution); tolerance 0.00001.
  it("paired signed-rank test", () => {
    const x = [1.83, 0.5, 1.62, 2.48, 1.68, 1.88, 1.55, 3.06, 1.3];
    const y = [0.878, 0.647, 0.598, 2.05, 1.06, 1.29, 1.06, 3.14, 1.29];
    const r = wilcoxonSignedRank(x, y, "greater");
    expect(r.statistic).toBe(40);
    expect(r.method).toBe("exact");
    expect(Math.abs(r.pValue - 0.01953)).toBeLessThanOrEqual(1e-5);
  });

  // Hollander and Wolfe 1973 two-sample data; W = 35, one-sided exact p = 0.1272; tolerance 0.0001.
  it("two-sample Mann-Whitney test", () => {
    const x = [0.8, 0.83, 1.89, 1.04, 1.45, 1.38, 1.91, 1.64, 0.73, 1.46];
    const y = [1.15, 0.88, 0.9, 0.74, 1.21];
    const r = mannWhitney(x, y, "greater");
    expect(r.statistic).toBe(35);
    expect(Math.abs(r.pValue - 0.1272)).toBeLessThanOrEqual(1e-4);
    expect(mannWhitney(y, x, "less").pValue).toBeCloseTo(r.pValue, 12);
  });

  it("exact and normal forms roughly agree for moderate samples", () => {
    const x = Array.from({ length: 20 }, (_, i) => i * 1.1 + 0.3);
    const y = Array.from({ length: 20 }, (_, i) => i * 1.05 + 2.01);
    const exact = mannWhitney(x, y);
    const tied = mannWhitney([...x, 5.8], [...y, 5.8]);
    expect(exact.method).toBe("exact");
    expect(tied.method).toBe("normal-approximation");
    expect(Math.abs(exact.pValue - tied.pValue)).toBeLessThan(0.1);
  });
});
