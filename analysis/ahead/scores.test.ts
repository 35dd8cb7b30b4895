import { describe, expect, it } from "vitest";
import { brierPartition, brierScore, calibrationTable, skillScore, topShareCatch } from "./scores";

// Brier score: G. W. Brier (1950), "Verification of forecasts expressed in
// terms of probability", Monthly Weather Review 78(1):1-3. Brier sums the
// squared error over both outcome classes; the usual two-outcome form (Wilks,
// "Statistical Methods in the Atmospheric Sciences", forecast verification chapter;
// recalled, not re-read here)
// is half of that. Murphy's partition: A. H. Murphy (1973), "A new vector
// partition of the probability score", J. Applied Meteorology 12:595-600;
// reliability, resolution and uncertainty as Wilks gives them with the
// reliability diagram. Values below are worked from those definitions (DERIVED).

describe("brierScore", () => {
  it("scores single rain forecasts as the squared miss", () => {
    // 70% and it rains: (0.7 - 1)^2 = 0.09; 30% and it rains: 0.49; 100% and it rains: 0.
    expect(brierScore([{ probability: 0.7, outcome: 1 }])).toBeCloseTo(0.09, 12);
    expect(brierScore([{ probability: 0.3, outcome: 1 }])).toBeCloseTo(0.49, 12);
    expect(brierScore([{ probability: 1, outcome: 1 }])).toBe(0);
    // Brier's two-class sum for the 70% forecast: (0.7 - 1)^2 + (0.3 - 0)^2 = 0.18, twice the one-outcome form.
    expect((0.7 - 1) ** 2 + (0.3 - 0) ** 2).toBeCloseTo(2 * brierScore([{ probability: 0.7, outcome: 1 }]), 12);
  });

  it("averages over forecasts and is NaN for none", () => {
    // (0.09 + 0.49 + 0.04 + 0) / 4 = 0.155
    const forecasts = [
      { probability: 0.7, outcome: 1 },
      { probability: 0.3, outcome: 1 },
      { probability: 0.2, outcome: 0 },
      { probability: 0, outcome: 0 },
    ];
    expect(brierScore(forecasts)).toBeCloseTo(0.155, 12);
    expect(brierScore([])).toBeNaN();
  });
});

// Ten forecasts: four at 0.2 of which one verified, six at 0.8 of which four verified.
const tenForecasts = [
  ...[1, 0, 0, 0].map((outcome) => ({ probability: 0.2, outcome })),
  ...[1, 1, 1, 1, 0, 0].map((outcome) => ({ probability: 0.8, outcome })),
];

describe("calibration by tenths and Murphy's partition", () => {
  it("puts each forecast in its tenth with mean forecast and observed share", () => {
    const table = calibrationTable(tenForecasts);
    expect(table).toHaveLength(10);
    expect(table[2]).toEqual({ from: 0.2, to: 0.3, count: 4, meanPredicted: 0.2, observed: 0.25, events: 1 });
    expect(table[8]!.count).toBe(6);
    expect(table[8]!.meanPredicted).toBeCloseTo(0.8, 12);
    expect(table[8]!.observed).toBeCloseTo(4 / 6, 12);
    expect(table.filter((b) => b.count === 0).every((b) => b.meanPredicted === null && b.observed === null)).toBe(true);
  });

  it("keeps a forecast of exactly 1 in the last tenth", () => {
    expect(calibrationTable([{ probability: 1, outcome: 1 }])[9]!.count).toBe(1);
  });

  it("adds reliability, resolution and uncertainty up to the Brier score", () => {
    // BS = (0.64 + 3 x 0.04 + 4 x 0.04 + 2 x 0.64) / 10 = 2.2 / 10 = 0.22
    expect(brierScore(tenForecasts)).toBeCloseTo(0.22, 12);
    const { reliability, resolution, uncertainty } = brierPartition(calibrationTable(tenForecasts));
    // REL = (4 (0.2 - 0.25)^2 + 6 (0.8 - 2/3)^2) / 10 = (0.01 + 0.106667) / 10 = 0.0116667
    expect(reliability).toBeCloseTo(0.0116667, 6);
    // RES = (4 (0.25 - 0.5)^2 + 6 (2/3 - 0.5)^2) / 10 = (0.25 + 0.166667) / 10 = 0.0416667
    expect(resolution).toBeCloseTo(0.0416667, 6);
    // UNC = 0.5 x 0.5 = 0.25
    expect(uncertainty).toBeCloseTo(0.25, 12);
    expect(reliability - resolution + uncertainty).toBeCloseTo(0.22, 12);
  });

  it("gives the base rate forecast a Brier score equal to the uncertainty, so skill is measured against it", () => {
    const baseRate = tenForecasts.map((f) => ({ probability: 0.5, outcome: f.outcome }));
    expect(brierScore(baseRate)).toBeCloseTo(0.25, 12);
    // 1 - 0.22 / 0.25 = 0.12
    expect(skillScore(brierScore(tenForecasts), brierScore(baseRate))).toBeCloseTo(0.12, 12);
  });
});

describe("topShareCatch", () => {
  it("counts events among the top tenth", () => {
    // 20 forecasts: the top 10% is 2 places; scores 20 and 19 hold one event of three.
    const scored = Array.from({ length: 20 }, (_, i) => ({ score: i + 1, outcome: i === 19 || i === 5 || i === 0 ? 1 : 0 }));
    expect(topShareCatch(scored, 0.1)).toEqual({ flagged: 2, caught: 1, events: 3 });
  });

  it("shares the last places evenly among forecasts tied at the cut", () => {
    // 10 forecasts, 1 place; all tied at 0, two events: each tied one gets 1/10 of a place, 2 x 1/10 = 0.2 caught.
    const tied = Array.from({ length: 10 }, (_, i) => ({ score: 0, outcome: i < 2 ? 1 : 0 }));
    const result = topShareCatch(tied, 0.1);
    expect(result.flagged).toBe(1);
    expect(result.caught).toBeCloseTo(0.2, 12);
    // One clear leader plus 4 tied for the second of 2 places (share 0.2 of 10): 1 + 2 events x 1/4 = 1.5.
    const mixed = [{ score: 5, outcome: 1 }, ...[1, 1, 0, 0].map((outcome) => ({ score: 2, outcome })), ...Array.from({ length: 5 }, () => ({ score: 1, outcome: 0 }))];
    expect(topShareCatch(mixed, 0.2).caught).toBeCloseTo(1.5, 12);
  });

  it("does not depend on the input order", () => {
    const scored = [0.3, 0.1, 0.3, 0.9, 0.2, 0.3].map((score, i) => ({ score, outcome: i % 2 }));
    const reversed = [...scored].reverse();
    expect(topShareCatch(scored, 0.5)).toEqual(topShareCatch(reversed, 0.5));
  });
});
