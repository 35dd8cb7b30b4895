import { quantileSorted } from "d3-array";
import { describe, expect, it } from "vitest";
import { percentileOfCounts } from "./percentile-of-counts";

describe("percentile of counted values", () => {
  // Type 7 quantiles (Hyndman and Fan 1996, R's default, SQL PERCENTILE_CONT):
  // 0.05 0.05 0.10 0.15 0.25 0.35 0.40 -> positions 1.5, 3, 4.5 -> 0.075, 0.15, 0.30.
  const counts = [
    { value: 0.05, n: 2 },
    { value: 0.1, n: 1 },
    { value: 0.15, n: 1 },
    { value: 0.25, n: 1 },
    { value: 0.35, n: 1 },
    { value: 0.4, n: 1 },
  ];

  it("matches the worked example", () => {
    expect(percentileOfCounts(counts, 7, 0.25)).toBeCloseTo(0.075, 12);
    expect(percentileOfCounts(counts, 7, 0.5)).toBeCloseTo(0.15, 12);
    expect(percentileOfCounts(counts, 7, 0.75)).toBeCloseTo(0.3, 12);
  });

  it("agrees with d3's type-7 quantile on the expanded values", () => {
    const expanded = counts.flatMap((c) => Array<number>(c.n).fill(c.value));
    for (const p of [0, 0.1, 0.33, 0.5, 0.9, 1]) expect(percentileOfCounts(counts, 7, p)).toBeCloseTo(quantileSorted(expanded, p)!, 12);
  });
});
