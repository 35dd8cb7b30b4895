import { describe, expect, it } from "vitest";
import {
  GRAMS_PER_OUNCE,
  LITRES_PER_IMPERIAL_GALLON,
  MILLILITRES_PER_US_FLUID_OUNCE,
  convertProductAmount,
  equivalentIn,
  labelAmountForPool,
  litresToWaterVolume,
  productUnit,
  sequestrantPhNote,
  waterVolumeToLitres,
} from "./label-dose";

// Exact definitions, NIST Handbook 44 (2024), appendix C, "Tables of equivalents":
//   1 US gallon = 3.785 411 784 L; 1 US fluid ounce = 29.573 529 562 5 mL;
//   1 US liquid quart = 0.946 352 946 L; 1 pound (avoirdupois) = 0.453 592 37 kg;
//   1 ounce (avoirdupois) = 28.349 523 125 g; 1 gallon (Canadian and British imperial) = 4.546 09 L.
// The imperial gallon's 4.546 09 L is also its legal definition in the UK Weights and Measures Act 1985, schedule 1.
describe("water volumes (NIST Handbook 44, appendix C)", () => {
  it.each([
    { amount: 1, unit: "us-gal", litres: 3.785411784 },
    { amount: 1, unit: "imp-gal", litres: 4.54609 },
    { amount: 1, unit: "m3", litres: 1000 },
    { amount: 10_000, unit: "us-gal", litres: 37_854.11784 },
    { amount: 10_000, unit: "imp-gal", litres: 45_460.9 },
  ] as const)("$amount $unit = $litres L", ({ amount, unit, litres }) => {
    expect(waterVolumeToLitres(amount, unit)).toBeCloseTo(litres, 9);
    expect(litresToWaterVolume(litres, unit)).toBeCloseTo(amount, 9);
  });

  it("an imperial gallon is 1.200 95 US gallons (derived from the two exact definitions)", () => {
    expect(litresToWaterVolume(LITRES_PER_IMPERIAL_GALLON, "us-gal")).toBeCloseTo(1.20095, 5);
  });
});

describe("product amounts (NIST Handbook 44, appendix C)", () => {
  it("holds the exact definitions", () => {
    expect(MILLILITRES_PER_US_FLUID_OUNCE).toBeCloseTo(29.5735295625, 10);
    expect(GRAMS_PER_OUNCE).toBeCloseTo(28.349523125, 9);
  });

  it.each([
    { amount: 1, from: "fl oz", to: "mL", expected: 29.5735295625 },
    { amount: 128, from: "fl oz", to: "gal", expected: 1 },
    { amount: 1, from: "qt", to: "L", expected: 0.946352946 },
    { amount: 1, from: "gal", to: "L", expected: 3.785411784 },
    { amount: 1, from: "lb", to: "kg", expected: 0.45359237 },
    { amount: 1, from: "oz", to: "g", expected: 28.349523125 },
    { amount: 16, from: "oz", to: "lb", expected: 1 },
    { amount: 1, from: "kg", to: "lb", expected: 2.20462262 },
    { amount: 1, from: "L", to: "fl oz", expected: 33.8140227 },
  ])("$amount $from = $expected $to", ({ amount, from, to, expected }) => {
    expect(convertProductAmount(amount, from, to)).toBeCloseTo(expected, 6);
  });

  it("does not turn a volume into a mass, or convert units it does not know", () => {
    expect(convertProductAmount(1, "fl oz", "g")).toBeNull();
    expect(convertProductAmount(1, "pad", "each")).toBeNull();
  });

  it("reads the usual spellings of a dose unit", () => {
    for (const text of ["fl oz", "floz", "Fl. oz", "fluid ounces"]) expect(productUnit(text)?.name).toBe("fl oz");
    for (const text of ["lbs", "Pounds", "lb"]) expect(productUnit(text)?.name).toBe("lb");
    for (const text of ["Litres", "liter", "l", "L"]) expect(productUnit(text)?.name).toBe("L");
    expect(productUnit("ml")?.name).toBe("mL");
    expect(productUnit("pad")).toBeNull();
  });

  it("restates an amount in the company's system, in a unit of its size", () => {
    expect(equivalentIn(40, "fl oz", "metric")).toEqual({ amount: expect.closeTo(1.18294, 5), unit: "L" });
    expect(equivalentIn(12, "oz", "metric")).toEqual({ amount: expect.closeTo(340.194, 3), unit: "g" });
    expect(equivalentIn(500, "mL", "us")).toEqual({ amount: expect.closeTo(16.907, 3), unit: "fl oz" });
    expect(equivalentIn(40, "fl oz", "us")).toBeNull();
  });
});

describe("the label amount for one pool", () => {
  const sequestrant = { labelDose: 32, maintenanceDose: 8, doseUnit: "fl oz", doseBasis: "per_10k_gal" } as const;

  // Worked: 32 fl oz per 10,000 US gal in 20,000 US gal = 64 fl oz = 1,892.7 mL; 8 fl oz per 10,000 gal = 16 fl oz.
  it("scales both label doses by the pool's volume, in the product's unit", () => {
    const answer = labelAmountForPool(sequestrant, waterVolumeToLitres(20_000, "us-gal"), "us");
    expect(answer).toMatchObject({ kind: "amounts", unit: "fl oz", startEquivalent: null });
    if (answer.kind !== "amounts") throw new Error("expected amounts");
    expect(answer.start).toBeCloseTo(64, 9);
    expect(answer.maintenance).toBeCloseTo(16, 9);
  });

  // Worked: 15,000 imperial gal = 68,191.35 L = 18,014.24 US gal; 16 fl oz per 10,000 US gal gives 28.823 fl oz = 852.4 mL.
  it("takes a pool measured in imperial gallons through litres", () => {
    const answer = labelAmountForPool({ ...sequestrant, labelDose: 16, maintenanceDose: null }, waterVolumeToLitres(15_000, "imp-gal"), "metric");
    if (answer.kind !== "amounts") throw new Error("expected amounts");
    expect(answer.start).toBeCloseTo(28.8228, 4);
    expect(answer.maintenance).toBeNull();
    expect(answer.startEquivalent).toEqual({ amount: expect.closeTo(852.4, 1), unit: "mL" });
  });

  // Worked: 100 mL per 10 m3 in a 45 m3 pool = 450 mL; 1.5 lb per 10,000 gal in 30,000 gal = 4.5 lb = 2.041 kg.
  it("uses a per-10 m3 label as it is, and restates pounds in kilograms for a metric company", () => {
    const metric = labelAmountForPool({ labelDose: 100, maintenanceDose: null, doseUnit: "mL", doseBasis: "per_10_m3" }, waterVolumeToLitres(45, "m3"), "metric");
    expect(metric).toMatchObject({ kind: "amounts", unit: "mL", start: expect.closeTo(450, 9) });
    const acid = labelAmountForPool({ labelDose: 1.5, maintenanceDose: null, doseUnit: "lb", doseBasis: "per_10k_gal" }, waterVolumeToLitres(30_000, "us-gal"), "metric");
    expect(acid).toMatchObject({ start: expect.closeTo(4.5, 9), startEquivalent: { amount: expect.closeTo(2.041166, 6), unit: "kg" } });
  });

  it("says when the volume is unknown, and has nothing to say without a label dose", () => {
    expect(labelAmountForPool(sequestrant, null, "us")).toEqual({ kind: "volume-unknown" });
    expect(labelAmountForPool({ ...sequestrant, labelDose: null, maintenanceDose: null }, 50_000, "us")).toEqual({ kind: "no-label" });
    expect(labelAmountForPool({ ...sequestrant, doseUnit: null }, 50_000, "us")).toEqual({ kind: "no-label" });
  });
});

describe("sequestrant and pH (common practice: dosed at pH 7.2 to 7.6; the label rules)", () => {
  it.each([7.2, 7.4, 7.6])("says nothing at pH %s", (ph) => expect(sequestrantPhNote(ph)).toBeNull());
  it.each([7.1, 7.7, 8.2])("notes pH %s", (ph) => expect(sequestrantPhNote(ph)).toMatch(`pH ${ph} is outside 7.2–7.6`));
  it("says nothing before a pH is entered", () => expect(sequestrantPhNote(undefined)).toBeNull());
});
