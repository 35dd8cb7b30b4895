import { describe, expect, it } from "vitest";
import {
  DEFAULT_METAL_THRESHOLDS,
  DRINKING_WATER_CONTEXT,
  formatMetalReading,
  metalStatus,
  validateThresholds,
} from "./reading";

describe("metal readings", () => {
  it("formats back to the technician's notation", () => {
    expect(formatMetalReading({ value: 0.05, belowDetection: true })).toBe("<0.05");
  });
});

describe("metal status", () => {
  // Pool staining levels copper 0.3 / iron 0.2 / manganese 0.05 elevated, 0.1 / 0.1 / 0.02 clear:
  // common practice (no published source).
  const { copper, iron, manganese } = DEFAULT_METAL_THRESHOLDS;
  const at = (value: number, belowDetection = false) => ({ value, belowDetection });

  it("elevated is inclusive, clear is exclusive", () => {
    expect(metalStatus(at(0.3), copper)).toBe("elevated");
    expect(metalStatus(at(0.29), copper)).toBe("watch");
    expect(metalStatus(at(0.1), copper)).toBe("watch");
    expect(metalStatus(at(0.09), copper)).toBe("clear");
    expect(metalStatus(at(0.2), iron)).toBe("elevated");
    expect(metalStatus(at(0.05), manganese)).toBe("elevated");
    expect(metalStatus(at(0.019), manganese)).toBe("clear");
  });

  it("a detection limit at or below clear counts as clear, above it as unknown", () => {
    expect(metalStatus(at(0.1, true), copper)).toBe("clear");
    expect(metalStatus(at(0.05, true), copper)).toBe("clear");
    expect(metalStatus(at(0.2, true), copper)).toBe("unknown");
    expect(metalStatus(at(0.5, true), copper)).toBe("unknown");
    expect(metalStatus(at(0.05, true), manganese)).toBe("unknown");
  });

  it("uses company thresholds when given", () => {
    expect(metalStatus(at(0.25), { elevated: 0.25, clear: 0.05 })).toBe("elevated");
    expect(validateThresholds(DEFAULT_METAL_THRESHOLDS)).toEqual([]);
    expect(validateThresholds({ ...DEFAULT_METAL_THRESHOLDS, iron: { elevated: 0.05, clear: 0.1 } })).toHaveLength(1);
  });

  // US EPA 40 CFR 143.3 secondary standards (copper 1.0, iron 0.3, manganese 0.05 mg/L),
  // 40 CFR 141.80(c) copper action level 1.3 mg/L, WHO guideline copper 2 mg/L: context only.
  it("keeps drinking-water limits as context", () => {
    expect(DRINKING_WATER_CONTEXT.secondaryStandard).toEqual({ copper: 1.0, iron: 0.3, manganese: 0.05 });
    expect(DRINKING_WATER_CONTEXT.copperActionLevel).toBe(1.3);
    expect(DRINKING_WATER_CONTEXT.whoCopperGuideline).toBe(2);
  });
});
