import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  CALCIUM_FACTORS,
  ALKALINITY_FACTORS,
  carbonateAlkalinity,
  classifyBalance,
  continuousSaturationIndex,
  cyanurateAlkalinityFactor,
  factorTableSaturationIndex,
  saturationFactors,
  saturationIndex,
  saturationPh,
} from "./saturation";
import { fahrenheitToCelsius } from "../units/convert";

describe("continuous saturation index", () => {
  // Langelier 1936 definition in the form of the Carrier water-conditioning design manual;
  // worked example pH 7.5, TDS 320, Ca hardness 150, alkalinity 34.
  it("reproduces the 25 degC worked example", () => {
    expect(saturationPh(320, 25, 150, 34)).toBeCloseTo(8.2312, 3); // unrounded, tolerance 0.001
    expect(Math.abs(saturationPh(320, 25, 150, 34) - 8.2)).toBeLessThanOrEqual(0.05); // printed value
    const lsi = continuousSaturationIndex(7.5, 320, 25, 150, 34);
    expect(Math.abs(lsi - -0.7312)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(lsi - -0.7)).toBeLessThanOrEqual(0.05);
  });

  it("reproduces the 82 degC worked example", () => {
    expect(Math.abs(saturationPh(320, 82, 150, 34) - 7.2339)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(saturationPh(320, 82, 150, 34) - 7.2)).toBeLessThanOrEqual(0.05);
    const lsi = continuousSaturationIndex(7.5, 320, 82, 150, 34);
    expect(Math.abs(lsi - 0.2661)).toBeLessThanOrEqual(0.001);
    expect(Math.abs(lsi - 0.3)).toBeLessThanOrEqual(0.05);
  });
});

describe("factor-table saturation index", () => {
  // New York State Sanitary Code, 10 NYCRR 6-1.30 worked example:
  // 68 degF, calcium hardness 140, TA 20, pH 7.8 -> TF 0.52, CF 1.76, AF 1.225, SI -0.8.
  it("reproduces the pool-code worked example with linear interpolation", () => {
    const f = saturationFactors(fahrenheitToCelsius(68), 140, 20, null);
    expect(f.temperatureFactor).toBeCloseTo(0.52, 10);
    expect(f.calciumFactor).toBeCloseTo(1.76, 10);
    expect(f.alkalinityFactor).toBeCloseTo(1.225, 10);
    expect(f.constant).toBe(12.1);
    const si = factorTableSaturationIndex(7.8, fahrenheitToCelsius(68), 140, 20);
    expect(Math.abs(si - -0.8)).toBeLessThanOrEqual(0.05);
    expect(si).toBeCloseTo(-0.795, 10);
    expect(classifyBalance(si)).toBe("corrosive");
  });

  // Montana pool rules, ARM title 37 ch. 115, table 7 (2010): constant 12.2 above 1,000 mg/L TDS.
  it("uses 12.2 above 1,000 mg/L TDS", () => {
    const t = fahrenheitToCelsius(68);
    expect(saturationFactors(t, 140, 20, 1000).constant).toBe(12.1);
    expect(saturationFactors(t, 140, 20, 1001).constant).toBe(12.2);
    expect(factorTableSaturationIndex(7.8, t, 140, 20, 3200)).toBeCloseTo(-0.895, 10);
  });

  // Derived: CF = log10(CH) - 0.4 and AF = log10(TA) reproduce every row of the
  // 10 NYCRR 6-1.30 table after rounding to 0.1.
  it("table rows agree with the logarithmic definitions", () => {
    for (const [hardness, factor] of CALCIUM_FACTORS) {
      expect(Math.round((Math.log10(hardness) - 0.4) * 10) / 10).toBeCloseTo(factor, 10);
    }
    for (const [alkalinity, factor] of ALKALINITY_FACTORS) {
      expect(Math.round(Math.log10(alkalinity) * 10) / 10).toBeCloseTo(factor, 10);
    }
  });

  it("holds the end rows outside the table and says so", () => {
    const r = saturationIndex({ ph: 7.5, temperatureC: 0, calciumHardness: 1500, totalAlkalinity: 100 });
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.index).toBeCloseTo(7.5 + 0 + 2.6 + 2.0 - 12.1, 10);
      expect(r.notes.some((n) => n.includes("calciumHardness"))).toBe(true);
    }
  });

  it("is monotone in pH, hardness, alkalinity and temperature", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 6, max: 9, noNaN: true }),
        fc.double({ min: 1, max: 40, noNaN: true }),
        fc.double({ min: 10, max: 900, noNaN: true }),
        fc.double({ min: 10, max: 400, noNaN: true }),
        (ph, t, ch, ta) => {
          const base = factorTableSaturationIndex(ph, t, ch, ta);
          expect(factorTableSaturationIndex(ph + 0.1, t, ch, ta)).toBeGreaterThan(base);
          expect(factorTableSaturationIndex(ph, t + 1, ch, ta)).toBeGreaterThanOrEqual(base);
          expect(factorTableSaturationIndex(ph, t, ch * 1.1, ta)).toBeGreaterThan(base);
          expect(factorTableSaturationIndex(ph, t, ch, ta * 1.1)).toBeGreaterThan(base);
        },
      ),
    );
  });
});

describe("cyanuric acid correction", () => {
  // Derived from cyanuric acid's pKa 6.83 and 50.043 / 129.07; tolerance 0.0001 against the
  // formula row of the check table, 0.01 against the widely printed rounded factors
  // (secondary source).
  const rows: Array<[ph: number, formula: number, printed: number]> = [
    [7.0, 0.2313, 0.23],
    [7.2, 0.2718, 0.27],
    [7.4, 0.3055, 0.31],
    [7.6, 0.3314, 0.33],
    [7.8, 0.3502, 0.35],
    [8.0, 0.3632, 0.36],
  ];
  it.each(rows)("factor at pH %s", (ph, formula, printed) => {
    expect(Math.abs(cyanurateAlkalinityFactor(ph) - formula)).toBeLessThanOrEqual(0.0001);
    expect(Math.abs(cyanurateAlkalinityFactor(ph) - printed)).toBeLessThanOrEqual(0.01);
  });

  // Secondary source: pH 7.2, TA 120, CYA 100 -> 93 mg/L carbonate alkalinity; tolerance 0.5.
  it("corrects 120 mg/L TA with 100 mg/L CYA at pH 7.2 to about 93", () => {
    expect(Math.abs(carbonateAlkalinity(120, 100, 7.2) - 93)).toBeLessThanOrEqual(0.5);
  });

  it("is applied by default and can be switched off", () => {
    const test = { ph: 7.2, temperatureC: 28, calciumHardness: 300, totalAlkalinity: 120, cyanuricAcid: 100 };
    const corrected = saturationIndex(test);
    const raw = saturationIndex(test, { correctForCyanuricAcid: false });
    expect(corrected.ok && raw.ok).toBe(true);
    if (corrected.ok && raw.ok) {
      expect(corrected.carbonateAlkalinity).toBeCloseTo(carbonateAlkalinity(120, 100, 7.2), 10);
      expect(raw.carbonateAlkalinity).toBe(120);
      expect(corrected.index).toBeLessThan(raw.index);
    }
  });
});

describe("saturation index per test", () => {
  it("names the missing inputs instead of guessing", () => {
    const r = saturationIndex({ ph: 7.4, totalAlkalinity: 90 });
    expect(r).toMatchObject({ ok: false, missing: ["temperatureC", "calciumHardness"] });
    const c = saturationIndex({ ph: 7.4, totalAlkalinity: 90, temperatureC: 25, calciumHardness: 200 }, { form: "continuous" });
    expect(c).toMatchObject({ ok: false, missing: ["tds"] });
  });

  it("refuses a non-positive carbonate alkalinity", () => {
    const r = saturationIndex({ ph: 7.8, temperatureC: 25, calciumHardness: 200, totalAlkalinity: 20, cyanuricAcid: 100 });
    expect(r.ok).toBe(false);
  });

  it("takes a salt reading as the TDS lower bound for the high-TDS constant", () => {
    const base = { ph: 7.5, temperatureC: 25, calciumHardness: 250, totalAlkalinity: 80 };
    const plain = saturationIndex(base);
    const salted = saturationIndex({ ...base, salt: 3200 });
    expect(plain.ok && salted.ok).toBe(true);
    if (plain.ok && salted.ok) expect(plain.index - salted.index).toBeCloseTo(0.1, 10);
  });

  it("the continuous form agrees with the worked example through the per-test entry", () => {
    const r = saturationIndex({ ph: 7.5, tds: 320, temperatureC: 25, calciumHardness: 150, totalAlkalinity: 34 }, { form: "continuous" });
    expect(r.ok && Math.abs(r.index - -0.7312)).toBeLessThanOrEqual(0.001);
  });
});

describe("balance classification", () => {
  // Band -0.3..+0.3: common practice (no published source).
  it("classifies with an adjustable band", () => {
    expect(classifyBalance(-0.31)).toBe("corrosive");
    expect(classifyBalance(-0.3)).toBe("balanced");
    expect(classifyBalance(0.3)).toBe("balanced");
    expect(classifyBalance(0.31)).toBe("scale-forming");
    // 10 NYCRR 6-1.30 accepts +/-0.5 around zero.
    expect(classifyBalance(-0.45, { low: -0.5, high: 0.5 })).toBe("balanced");
  });
});
