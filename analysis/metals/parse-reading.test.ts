import { describe, expect, it } from "vitest";
import { parseMetalReading } from "./parse-reading";

describe("metal readings", () => {
  it("parses plain values, detection limits, units and decimal commas", () => {
    expect(parseMetalReading("0.3")).toEqual({ ok: true, reading: { value: 0.3, belowDetection: false } });
    expect(parseMetalReading("<0.05")).toEqual({ ok: true, reading: { value: 0.05, belowDetection: true } });
    expect(parseMetalReading(" < 0.05 ppm ")).toEqual({ ok: true, reading: { value: 0.05, belowDetection: true } });
    expect(parseMetalReading("0,2 mg/L")).toEqual({ ok: true, reading: { value: 0.2, belowDetection: false } });
    expect(parseMetalReading(".5")).toEqual({ ok: true, reading: { value: 0.5, belowDetection: false } });
    expect(parseMetalReading("")).toEqual({ ok: true, reading: null });
  });

  it("rejects garbage and out-of-bound values naming field, value and bound", () => {
    const high = parseMetalReading("12", "copper");
    expect(high.ok).toBe(false);
    if (!high.ok) expect(high.message).toBe("copper: 12 mg/L is above the accepted maximum of 10 mg/L");
    expect(parseMetalReading("blue").ok).toBe(false);
    expect(parseMetalReading("-0.1").ok).toBe(false);
    expect(parseMetalReading("<0").ok).toBe(false);
  });
});
