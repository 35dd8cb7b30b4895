import { describe, expect, it } from "vitest";
import { DEFAULT_METAL_THRESHOLDS } from "@analysis/metals/reading";
import { parseTemperature } from "./visit";
import { asksForMetalTest, liveVisit, treatmentCost, visitWarnings } from "./visit-live";

const products = [
  { id: 1, category: "sequestrant", doseUnit: "fl oz", unitCost: 0.75 },
  { id: 2, category: "ph_decreaser", doseUnit: "l", unitCost: null },
];
const noLines: never[] = [];

describe("the visit form's live saturation index", () => {
  // New York State Sanitary Code, 10 NYCRR 6-1.30 worked example, with linear
  // interpolation between the table's rows: 68 degF, calcium hardness 140,
  // TA 20, pH 7.8 -> TF 0.52 + CF 1.76 + AF 1.225 + 7.8 - 12.1 = -0.795, printed -0.8.
  it("reproduces the pool-code worked example from the typed form", () => {
    const typed = { ph: "7.8", temperature: "68", temperatureUnit: "F", calciumHardness: "140", totalAlkalinity: "20" };
    const { balance } = liveVisit(typed, noLines, products, DEFAULT_METAL_THRESHOLDS);
    expect(balance.ok).toBe(true);
    if (!balance.ok) return;
    expect(Math.abs(balance.index - -0.795)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(balance.index - -0.8)).toBeLessThanOrEqual(0.05);
  });

  it("reads decimal commas and a temperature in degC the same way", () => {
    // 68 degF = (68 - 32) x 5/9 = 20 degC exactly.
    const typed = { ph: "7,8", temperature: "20", temperatureUnit: "C", calciumHardness: "140", totalAlkalinity: "20" };
    const { balance } = liveVisit(typed, noLines, products, DEFAULT_METAL_THRESHOLDS);
    expect(balance.ok && Math.abs(balance.index - -0.795)).toBeLessThanOrEqual(0.001);
  });

  it("names what is missing instead of guessing", () => {
    const { balance } = liveVisit({ ph: "7.4", calciumHardness: "250" }, noLines, products, DEFAULT_METAL_THRESHOLDS);
    expect(balance).toMatchObject({ ok: false, missing: ["temperatureC", "totalAlkalinity"] });
  });
});

describe("the visit form's temperature units", () => {
  // degC = (degF - 32) x 5/9, the definition of the two scales (NIST SP 811, appendix B.8; recalled), kept to 0.1 degC.
  it("converts degF to degC by the toggle or by a suffix, the suffix winning", () => {
    expect(parseTemperature("82", "F")).toEqual({ ok: true, celsius: 27.8 }); // (82 - 32) x 5/9 = 27.78
    expect(parseTemperature("82F", "C")).toEqual({ ok: true, celsius: 27.8 });
    expect(parseTemperature("28 °C", "F")).toEqual({ ok: true, celsius: 28 });
    expect(parseTemperature("80,5", "F")).toEqual({ ok: true, celsius: 26.9 }); // (80.5 - 32) x 5/9 = 26.94
    expect(parseTemperature("", "F")).toEqual({ ok: true, celsius: null });
  });

  it("checks the bounds in degC and says both units", () => {
    expect(parseTemperature("120", "F")).toEqual({
      ok: false,
      message: "Temperature: 120 °F (48.9 °C) is above the highest accepted value, 45 °C (113 °F).",
    });
    expect(parseTemperature("warm", "C")).toEqual({ ok: false, message: 'Temperature: "warm" is not a temperature.' });
  });
});

describe("the visit form's warnings", () => {
  it("warns about a pH outside 6 to 9", () => {
    // A reading outside 6-9 is usually a reagent or reading fault: common practice (no published source).
    expect(visitWarnings({ ph: 9.5 }, DEFAULT_METAL_THRESHOLDS)).toEqual(["pH 9.5 is outside 6–9: check the reading and the reagent."]);
    expect(visitWarnings({ ph: 5.9 }, DEFAULT_METAL_THRESHOLDS)).toHaveLength(1);
    expect(visitWarnings({ ph: 9 }, DEFAULT_METAL_THRESHOLDS)).toEqual([]);
  });

  it("warns about metals at or above the elevated level", () => {
    // Staining levels copper 0.3, iron 0.2, manganese 0.05 mg/L: common practice (no published source).
    expect(visitWarnings({ copper: { value: 0.3, belowDetection: false } }, DEFAULT_METAL_THRESHOLDS)).toEqual([
      "Copper 0.3 mg/L is at or above the elevated level (0.3 mg/L).",
    ]);
    expect(visitWarnings({ copper: { value: 0.29, belowDetection: false } }, DEFAULT_METAL_THRESHOLDS)).toEqual([]);
    // "<0.5" says only that the value is below 0.5: not a warning.
    expect(visitWarnings({ copper: { value: 0.5, belowDetection: true } }, DEFAULT_METAL_THRESHOLDS)).toEqual([]);
    const strict = { ...DEFAULT_METAL_THRESHOLDS, iron: { elevated: 0.1, clear: 0.05 } };
    expect(visitWarnings({ iron: { value: 0.15, belowDetection: false } }, strict)).toHaveLength(1);
  });

  it("asks for a metal test after a blurred hardness endpoint until a metal is read", () => {
    // A blurred calcium-hardness endpoint often means dissolved metals: common practice (no published source).
    expect(asksForMetalTest("blurred", {})).toBe(true);
    expect(asksForMetalTest("blurred", { iron: { value: 0.05, belowDetection: true } })).toBe(false);
    expect(asksForMetalTest("clean", {})).toBe(false);
  });

  it("cautions about acid when pH is above the range or a pH decreaser is given", () => {
    // pH range 7.2 to 7.8: Montana pool rules, ARM 37.115.1308.
    expect(liveVisit({ ph: "7.9" }, noLines, products, DEFAULT_METAL_THRESHOLDS)).toMatchObject({ phHigh: true, acidGiven: false });
    expect(liveVisit({ ph: "7.8" }, noLines, products, DEFAULT_METAL_THRESHOLDS).phHigh).toBe(false);
    const acid = liveVisit({}, [{ productId: "2", amount: "1", unit: "l" }], products, DEFAULT_METAL_THRESHOLDS);
    expect(acid.acidGiven).toBe(true);
  });

  it("passes typed errors on by field", () => {
    expect(liveVisit({ ph: "15" }, noLines, products, DEFAULT_METAL_THRESHOLDS).errors).toEqual({
      ph: "pH: 15 is above the highest accepted value, 14.",
    });
  });
});

describe("the visit form's treatment cost", () => {
  const sequestrant = products[0];

  it("costs a line in the product's dose unit, decimal comma and case aside", () => {
    expect(treatmentCost({ productId: "1", amount: "2,5", unit: "FL OZ" }, sequestrant)).toBe(1.875); // 2.5 x 0.75
    expect(liveVisit({}, [{ productId: "1", amount: "8", unit: "fl oz" }], products, DEFAULT_METAL_THRESHOLDS).costs).toEqual([6]);
  });

  it("gives no cost when it cannot be known", () => {
    expect(treatmentCost({ productId: "1", amount: "2", unit: "ml" }, sequestrant)).toBeNull();
    expect(treatmentCost({ productId: "1", amount: "abc", unit: "fl oz" }, sequestrant)).toBeNull();
    expect(treatmentCost({ productId: "1", amount: "0", unit: "fl oz" }, sequestrant)).toBeNull();
    expect(treatmentCost({ productId: "2", amount: "1", unit: "l" }, products[1])).toBeNull();
    expect(treatmentCost({ productId: "9", amount: "1", unit: "l" }, undefined)).toBeNull();
  });
});
