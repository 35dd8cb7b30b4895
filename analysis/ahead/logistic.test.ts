import { describe, expect, it } from "vitest";
import { contributions, fitLogistic, predictProbability, rawCoefficients } from "./logistic";

// Physicians' Health Study, aspirin and myocardial infarction, as tabulated in
// Agresti, "Categorical Data Analysis" (2nd ed., 2002), Table 2.3:
// placebo 189 with MI of 11,034; aspirin 104 of 11,037.
// For one binary predictor the maximum-likelihood logistic fit is saturated:
// the intercept is the log odds of the x = 0 group and the slope the log odds
// ratio (Agresti sec. 5.1). Sample odds ratio (189 x 10,933) / (104 x 10,845) = 1.832 (Agresti prints 1.83).
const aspirinRows = [[1], [1], [0], [0]]; // 1 = placebo, 0 = aspirin
const aspirinOutcomes = [1, 0, 1, 0];
const aspirinWeights = [189, 11_034 - 189, 104, 11_037 - 104];

describe("fitLogistic", () => {
  it("reproduces the log odds ratio of the aspirin table with no penalty", () => {
    const model = fitLogistic(aspirinRows, aspirinOutcomes, { ridge: 0, weights: aspirinWeights });
    const { intercept, slopes } = rawCoefficients(model);
    expect(model.converged).toBe(true);
    // ln(104 / 10,933) = -4.65520
    expect(intercept).toBeCloseTo(Math.log(104 / 10_933), 6);
    expect(intercept).toBeCloseTo(-4.6552, 4);
    // ln(1.83205) = 0.60544
    expect(Math.exp(slopes[0]!)).toBeCloseTo(1.832, 3);
    expect(slopes[0]).toBeCloseTo(0.60544, 4);
    // Fitted risks equal the observed ones in a saturated model: 189 / 11,034 = 0.017129.
    expect(predictProbability(model, [1])).toBeCloseTo(189 / 11_034, 8);
    expect(predictProbability(model, [0])).toBeCloseTo(104 / 11_037, 8);
  });

  it("gives the same fit for weighted rows as for the rows written out one by one", () => {
    const rows: number[][] = [];
    const outcomes: number[] = [];
    // A small table: x = 1: 3 of 5; x = 0: 1 of 4.
    for (const [x, events, total] of [[1, 3, 5], [0, 1, 4]] as const) {
      for (let i = 0; i < total; i++) {
        rows.push([x]);
        outcomes.push(i < events ? 1 : 0);
      }
    }
    const expanded = rawCoefficients(fitLogistic(rows, outcomes, { ridge: 0 }));
    const weighted = rawCoefficients(fitLogistic([[1], [1], [0], [0]], [1, 0, 1, 0], { ridge: 0, weights: [3, 2, 1, 3] }));
    // Saturated: slope = ln((3/2) / (1/3)) = ln 4.5 = 1.504077
    expect(expanded.slopes[0]).toBeCloseTo(Math.log(4.5), 6);
    expect(weighted.slopes[0]).toBeCloseTo(expanded.slopes[0]!, 8);
    expect(weighted.intercept).toBeCloseTo(expanded.intercept, 8);
  });

  it("shrinks the slope toward zero under the ridge penalty and keeps the score equation of the intercept", () => {
    const free = rawCoefficients(fitLogistic(aspirinRows, aspirinOutcomes, { ridge: 0, weights: aspirinWeights }));
    const model = fitLogistic(aspirinRows, aspirinOutcomes, { ridge: 2000, weights: aspirinWeights });
    const penalised = rawCoefficients(model);
    expect(penalised.slopes[0]!).toBeGreaterThan(0);
    expect(penalised.slopes[0]!).toBeLessThan(free.slopes[0]!);
    // The intercept is not penalised, so fitted events still sum to the observed 189 + 104 = 293.
    const fittedEvents = 11_034 * predictProbability(model, [1]) + 11_037 * predictProbability(model, [0]);
    expect(fittedEvents).toBeCloseTo(293, 4);
  });

  it("starts from an earlier fit and lands on the same answer in fewer steps", () => {
    const cold = fitLogistic(aspirinRows, aspirinOutcomes, { ridge: 0, weights: aspirinWeights });
    const warm = fitLogistic(aspirinRows, aspirinOutcomes, { ridge: 0, weights: aspirinWeights, start: cold });
    expect(warm.iterations).toBeLessThan(cold.iterations);
    expect(rawCoefficients(warm).slopes[0]).toBeCloseTo(rawCoefficients(cold).slopes[0]!, 8);
  });

  it("splits a row's log-odds into contributions that add up to it", () => {
    const model = fitLogistic(
      [[0, 1], [1, 0], [1, 1], [0, 0], [1, 1], [0, 1]],
      [0, 1, 1, 0, 1, 0],
      { ridge: 1 },
    );
    const row = [1, 0];
    const logOdds = Math.log(predictProbability(model, row) / (1 - predictProbability(model, row)));
    const parts = contributions(model, row);
    expect(model.intercept + parts[0]! + parts[1]!).toBeCloseTo(logOdds, 10);
  });

  it("refuses rows and outcomes of different lengths", () => {
    expect(() => fitLogistic([[1]], [1, 0])).toThrow(/differ/);
    expect(() => fitLogistic([], [])).toThrow(/no rows/);
  });
});
