import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  ATOMIC_WEIGHT,
  LITRES_PER_US_GALLON,
  US_GALLONS_PER_CUBIC_FOOT,
  alkalinityRiseFromBicarbonate,
  calciumAsCalciumToHardnessAsCaCO3,
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  gallonsToLitres,
  hardnessAsCaCO3ToCalciumAsCalcium,
  litresToGallons,
  microgramsPerLitreToMilligramsPerLitre,
  poundsToKilograms,
} from "./convert";
import { isVolumeError, labelDose, poolVolume, type PoolShape } from "./volume";

describe("unit facts", () => {
  // NIST Handbook 44, appendix C: 1 US gallon = 231 in3 = 3.785411784 L exactly.
  it("gallon to litre is exact", () => {
    expect(gallonsToLitres(1)).toBe(3.785411784);
    expect(litresToGallons(3.785411784)).toBe(1);
    expect(231 * 2.54 ** 3 / 1000).toBeCloseTo(LITRES_PER_US_GALLON, 12);
  });

  // Derived from NIST Handbook 44: 1 ft3 = 1728/231 = 7.480519... US gal.
  it("cubic foot to gallons", () => {
    expect(US_GALLONS_PER_CUBIC_FOOT).toBeCloseTo(7.480519, 6);
    expect((12 * 2.54) ** 3 / 1000 / LITRES_PER_US_GALLON).toBeCloseTo(US_GALLONS_PER_CUBIC_FOOT, 12);
  });

  // Definition of the Celsius and Fahrenheit scales: degC = (degF - 32) x 5/9.
  it("temperature", () => {
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(fahrenheitToCelsius(212)).toBe(100);
    expect(fahrenheitToCelsius(68)).toBeCloseTo(20, 12);
    fc.assert(fc.property(fc.double({ min: -50, max: 150, noNaN: true }), (c) => {
      expect(fahrenheitToCelsius(celsiusToFahrenheit(c))).toBeCloseTo(c, 9);
    }));
  });

  it("micrograms per litre to mg/L", () => {
    expect(microgramsPerLitreToMilligramsPerLitre(50)).toBeCloseTo(0.05, 12);
  });

  // Standard Methods 2340 B (secondary) factor 2.497 = 100.086 / 40.078, derived from
  // CIAAW 2021 atomic weights; tolerance 0.0005.
  it("calcium as Ca to hardness as CaCO3", () => {
    expect(ATOMIC_WEIGHT.calcium).toBe(40.078);
    expect(Math.abs(calciumAsCalciumToHardnessAsCaCO3(1) - 2.497)).toBeLessThanOrEqual(0.0005);
    expect(hardnessAsCaCO3ToCalciumAsCalcium(calciumAsCalciumToHardnessAsCaCO3(80))).toBeCloseTo(80, 10);
  });

  // New York State Sanitary Code 10 NYCRR 6-1.30: 1.5 lb sodium bicarbonate raises the TA of
  // 10,000 gal by 10 mg/L; stoichiometry gives 10.7, which agrees within the code's rounding
  // (tolerance 1 mg/L).
  it("sodium bicarbonate raises alkalinity as the pool code says", () => {
    const rise = alkalinityRiseFromBicarbonate(poundsToKilograms(1.5), gallonsToLitres(10_000));
    expect(Math.abs(rise - 10.7)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(rise - 10)).toBeLessThanOrEqual(1);
  });
});

describe("pool volume", () => {
  const depth = { shallow: 3.5, deep: 6.5 };

  // Exact from NIST: 32 x 16 ft at 5 ft mean depth = 2560 ft3 = 19,150.13 gal.
  it("rectangle in feet", () => {
    const v = poolVolume({ shape: "rectangle", length: 32, width: 16, depth, unit: "ft" });
    expect(isVolumeError(v)).toBe(false);
    if (!isVolumeError(v)) {
      expect(v.gallons).toBeCloseTo(2560 * 1728 / 231, 6);
      expect(v.litres).toBeCloseTo(v.gallons * 3.785411784, 6);
    }
  });

  it("rectangle in metres gives litres directly", () => {
    const v = poolVolume({ shape: "rectangle", length: 10, width: 5, depth: { shallow: 1, deep: 2 }, unit: "m" });
    if (isVolumeError(v)) throw new Error("unexpected");
    expect(v.litres).toBeCloseTo(75_000, 6);
    expect(v.gallons).toBeCloseTo(75_000 / 3.785411784, 6);
  });

  it("round pool: 24 ft across, 4 ft deep", () => {
    const v = poolVolume({ shape: "round", diameter: 24, depth: { shallow: 4, deep: 4 }, unit: "ft" });
    if (isVolumeError(v)) throw new Error("unexpected");
    expect(v.gallons).toBeCloseTo(Math.PI * 144 * 4 * 7.480519480519, 4);
  });

  // The trade's oval shortcut is L x W x D x 5.9 (common practice, no published source);
  // the ellipse formula pi/4 x 7.4805 = 5.875 is within 0.5 % of it.
  it("oval agrees with the trade shortcut", () => {
    const v = poolVolume({ shape: "oval", length: 30, width: 15, depth: { shallow: 4, deep: 4 }, unit: "ft" });
    if (isVolumeError(v)) throw new Error("unexpected");
    const shortcut = 30 * 15 * 4 * 5.9;
    expect(Math.abs(v.gallons / shortcut - 1)).toBeLessThan(0.005);
  });

  // Kidney: 0.45 x (A + B) x length x mean depth, common practice (no published source).
  it("kidney", () => {
    const v = poolVolume({ shape: "kidney", length: 30, widthA: 10, widthB: 14, depth, unit: "ft" });
    if (isVolumeError(v)) throw new Error("unexpected");
    expect(v.gallons).toBeCloseTo(0.45 * 24 * 30 * 5 * (1728 / 231), 6);
  });

  it("rejects non-positive dimensions, naming the field", () => {
    expect(poolVolume({ shape: "round", diameter: 0, depth, unit: "ft" })).toEqual({ error: "non-positive-dimension", field: "diameter" });
    expect(poolVolume({ shape: "rectangle", length: 5, width: 5, depth: { shallow: -1, deep: 2 }, unit: "m" })).toMatchObject({ field: "shallowDepth" });
  });

  it("is linear in depth for every shape", () => {
    const shapes = fc.oneof(
      fc.record({ shape: fc.constant("rectangle" as const), length: fc.double({ min: 1, max: 30, noNaN: true }), width: fc.double({ min: 1, max: 30, noNaN: true }) }),
      fc.record({ shape: fc.constant("round" as const), diameter: fc.double({ min: 1, max: 30, noNaN: true }) }),
      fc.record({ shape: fc.constant("oval" as const), length: fc.double({ min: 1, max: 30, noNaN: true }), width: fc.double({ min: 1, max: 30, noNaN: true }) }),
      fc.record({ shape: fc.constant("kidney" as const), length: fc.double({ min: 1, max: 30, noNaN: true }), widthA: fc.double({ min: 1, max: 30, noNaN: true }), widthB: fc.double({ min: 1, max: 30, noNaN: true }) }),
    );
    fc.assert(
      fc.property(shapes, fc.constantFrom("ft" as const, "m" as const), fc.double({ min: 0.5, max: 4, noNaN: true }), fc.double({ min: 0.1, max: 5, noNaN: true }), (outline, unit, d, k) => {
        const at = (depthValue: number) => {
          const v = poolVolume({ ...outline, unit, depth: { shallow: depthValue, deep: depthValue } } as PoolShape);
          if (isVolumeError(v)) throw new Error("unexpected");
          return v;
        };
        const base = at(d);
        const scaled = at(d * k);
        expect(scaled.gallons / base.gallons).toBeCloseTo(k, 9);
        expect(scaled.litres / base.litres).toBeCloseTo(k, 9);
      }),
    );
  });
});

describe("label dose", () => {
  it("scales a per-10,000-gallon label rate to the pool", () => {
    const dose = labelDose({ amount: 16, unit: "fl oz", basis: "per-10000-gallons" }, { gallons: 25_000 });
    expect(dose.amount).toBeCloseTo(40, 10);
    expect(dose.unit).toBe("fl oz");
    expect(dose.caution).toMatch(/label/);
  });

  it("scales a per-10-m3 label rate and accepts either volume unit", () => {
    expect(labelDose({ amount: 100, unit: "mL", basis: "per-10-cubic-metres" }, { litres: 45_000 }).amount).toBeCloseTo(450, 10);
    const viaGallons = labelDose({ amount: 100, unit: "mL", basis: "per-10-cubic-metres" }, { gallons: 10_000 });
    expect(viaGallons.amount).toBeCloseTo(100 * 3.785411784, 8);
  });
});
