import { describe, expect, it } from "vitest";
import { DEFAULT_METAL_THRESHOLDS } from "@analysis/metals/reading";
import { waterVolumeToLitres } from "@analysis/units/label-dose";
import { liveVisit } from "./visit-live";

const products = [
  { id: 1, category: "sequestrant", doseUnit: "fl oz", unitCost: 0.62, labelDose: 32, maintenanceDose: 8, doseBasis: "per_10k_gal" as const },
  { id: 2, category: "ph_decreaser", doseUnit: "lb", unitCost: 2.15, labelDose: 1.5, maintenanceDose: null, doseBasis: "per_10k_gal" as const },
  { id: 3, category: "collector_pad", doseUnit: "each", unitCost: 24.5, labelDose: null, maintenanceDose: null, doseBasis: "per_10k_gal" as const },
];
const line = (productId: string, amount = "") => ({ productId, amount, unit: "" });
const pool20k = { volumeLitres: waterVolumeToLitres(20_000, "us-gal"), units: "us" as const };

describe("the visit form's label amount", () => {
  // NIST Handbook 44, appendix C (1 US gal = 3.785 411 784 L) and plain proportion:
  // 32 fl oz per 10,000 gal in 20,000 gal = 64 fl oz; 8 fl oz maintenance = 16 fl oz; 1.5 lb dry acid = 3 lb.
  it("shows each chosen product's label amount for the pool, line by line", () => {
    const { labelAmounts } = liveVisit({}, [line("1"), line("2"), line("")], products, DEFAULT_METAL_THRESHOLDS, pool20k);
    expect(labelAmounts[0]).toMatchObject({ kind: "amounts", unit: "fl oz", start: expect.closeTo(64, 9), maintenance: expect.closeTo(16, 9) });
    expect(labelAmounts[1]).toMatchObject({ kind: "amounts", unit: "lb", start: expect.closeTo(3, 9), maintenance: null });
    expect(labelAmounts[2]).toBeNull();
  });

  it("never fills in the amount: a typed amount stays as typed and the label figure is separate", () => {
    const { labelAmounts, costs } = liveVisit({}, [{ productId: "1", amount: "20", unit: "fl oz" }], products, DEFAULT_METAL_THRESHOLDS, pool20k);
    expect(labelAmounts[0]).toMatchObject({ start: expect.closeTo(64, 9) });
    // 20 fl oz x 0.62 per fl oz: the cost follows what was typed, not the label.
    expect(costs[0]).toBeCloseTo(12.4, 9);
  });

  it("says the volume is unknown rather than guessing, and says nothing for a product without a label dose", () => {
    const unknown = liveVisit({}, [line("1"), line("3")], products, DEFAULT_METAL_THRESHOLDS, { volumeLitres: null, units: "metric" });
    expect(unknown.labelAmounts).toEqual([{ kind: "volume-unknown" }, { kind: "no-label" }]);
  });

  // A metric company sees the US label restated: 64 fl oz x 29.573 529 562 5 mL = 1.893 L (NIST Handbook 44, appendix C).
  it("restates a US label in the company's metric units", () => {
    const { labelAmounts } = liveVisit({}, [line("1")], products, DEFAULT_METAL_THRESHOLDS, { ...pool20k, units: "metric" });
    expect(labelAmounts[0]).toMatchObject({ startEquivalent: { amount: expect.closeTo(1.8927, 4), unit: "L" } });
  });
});

describe("the visit form's sequestrant note (common practice: dosed at pH 7.2 to 7.6)", () => {
  it("notes a pH outside 7.2 to 7.6 only when a sequestrant is among the treatments", () => {
    expect(liveVisit({ ph: "7.9" }, [line("1")], products, DEFAULT_METAL_THRESHOLDS, pool20k).sequestrantNote).toMatch(/pH 7.9 is outside 7.2–7.6/);
    expect(liveVisit({ ph: "7.9" }, [line("2")], products, DEFAULT_METAL_THRESHOLDS, pool20k).sequestrantNote).toBeNull();
    expect(liveVisit({ ph: "7.4" }, [line("1")], products, DEFAULT_METAL_THRESHOLDS, pool20k).sequestrantNote).toBeNull();
    expect(liveVisit({}, [line("1")], products, DEFAULT_METAL_THRESHOLDS, pool20k).sequestrantNote).toBeNull();
  });
});
