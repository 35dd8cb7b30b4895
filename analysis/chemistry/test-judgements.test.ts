import { describe, expect, it } from "vitest";
import { DEFAULT_BALANCE_BAND } from "@analysis/chemistry/saturation";
import { DEFAULT_METAL_THRESHOLDS } from "@analysis/metals/reading";
import { fahrenheitToCelsius } from "@analysis/units/convert";
import { judgeTest, type StoredTest, testSaturationIndex } from "./test-judgements";

const blank: StoredTest = {
  freeChlorine: null, combinedChlorine: null, ph: null, totalAlkalinity: null, calciumHardness: null,
  cyanuricAcid: null, salt: null, tds: null, temperatureC: null,
  copper: null, copperBelowDetection: false, iron: null, ironBelowDetection: false, manganese: null, manganeseBelowDetection: false,
};

describe("testSaturationIndex", () => {
  it("reproduces the pool code's worked example", () => {
    // New York State Sanitary Code 10 NYCRR 6-1.30: 68 degF, CH 140, TA 20, pH 7.8 gives
    // TF 0.52 + CF 1.76 + AF 1.225 + 7.8 - 12.1 = -0.795, printed as -0.8.
    const index = testSaturationIndex({ ...blank, ph: 7.8, temperatureC: fahrenheitToCelsius(68), calciumHardness: 140, totalAlkalinity: 20 });
    expect(index).toBeCloseTo(-0.795, 3);
  });

  it("gives no figure when an input is missing", () => {
    expect(testSaturationIndex({ ...blank, ph: 7.5, calciumHardness: 200, totalAlkalinity: 100 })).toBeNull();
  });
});

describe("judgeTest", () => {
  it("judges each value against the ranges and metal levels", () => {
    const judged = judgeTest({ ...blank, ph: 8.1, freeChlorine: 3, copper: 0.3, iron: 0.05, ironBelowDetection: true }, DEFAULT_METAL_THRESHOLDS, DEFAULT_BALANCE_BAND);
    const byLabel = Object.fromEntries(judged.map((j) => [j.label, j.verdict]));
    // pH 8.1 > 7.8 (Montana pool rules upper bound); free chlorine 3 within 1-8.
    expect(byLabel).toMatchObject({ pH: "high", "Free chlorine": "in range" });
    // Copper 0.3 is at the elevated level (at or above 0.3, common practice, no published source);
    // "<0.05" iron is below the clear level 0.1, so clear.
    expect(byLabel).toMatchObject({ Copper: "elevated", Iron: "clear" });
  });
});
