import { describe, expect, it } from "vitest";
import { DEFAULT_THRESHOLDS, assessTest, resolveThresholds } from "./settings";
import { fahrenheitToCelsius } from "./units/convert";

describe("company thresholds", () => {
  it("override one field without losing the others", () => {
    const t = resolveThresholds({ balanceBand: { low: -0.5 }, episodes: { chronicAfterDays: 45 } });
    expect(t.balanceBand).toEqual({ low: -0.5, high: 0.3 });
    expect(t.episodes).toEqual({ recurrenceWindowDays: 365, chronicAfterDays: 45 });
    expect(t.metals).toBe(DEFAULT_THRESHOLDS.metals);
    expect(DEFAULT_THRESHOLDS.balanceBand.low).toBe(-0.3);
  });

  // 10 NYCRR 6-1.30 worked example through the per-test entry: SI -0.8, corrosive.
  it("assesses one test with the factor-table form by default", () => {
    const a = assessTest({ ph: 7.8, temperatureC: fahrenheitToCelsius(68), calciumHardness: 140, totalAlkalinity: 20, copper: { value: 0.32, belowDetection: false } });
    expect(a.saturation.ok && Math.abs(a.saturation.index - -0.8)).toBeLessThanOrEqual(0.05);
    expect(a.balance).toBe("corrosive");
    expect(a.metals).toEqual({ copper: "elevated", iron: "not-tested", manganese: "not-tested" });
    const lenient = assessTest({ ph: 7.8, temperatureC: fahrenheitToCelsius(68), calciumHardness: 140, totalAlkalinity: 20 }, resolveThresholds({ balanceBand: { low: -1 } }));
    expect(lenient.balance).toBe("balanced");
  });
});
