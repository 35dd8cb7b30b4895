import { describe, expect, it } from "vitest";
import { DAY_MS } from "./episodes";
import { likelySourceEvidence } from "./likely-source";
import type { PoolProfile } from "./route-book";

const onset = Date.UTC(2024, 6, 1);
const day = (n: number) => onset + n * DAY_MS;

const pool: PoolProfile = {
  poolId: "p1",
  fillSourceId: "well-7",
  fillSourceKind: "shared-well",
  sanitiser: "salt-chlorine-generator",
  equipment: [{ id: "h", kind: "heater", exchangerMetal: "cupronickel", installedAt: Date.UTC(2012, 3, 1), removedAt: null }],
};

describe("likely-source evidence", () => {
  it("copper: fill-water test, shared alert, old exchanger with corrosive water, algaecide", () => {
    const evidence = likelySourceEvidence({
      pool,
      metal: "copper",
      onsetAt: onset,
      fillSourceTests: [
        { fillSourceId: "well-7", takenAt: day(-100), copper: { value: 0.45, belowDetection: false } },
        { fillSourceId: "well-7", takenAt: day(-50), copper: { value: 0.05, belowDetection: true } }, // clear: no item
        { fillSourceId: "other", takenAt: day(-10), copper: { value: 0.9, belowDetection: false } }, // other source: no item
      ],
      sharedSourceAlerts: [
        { fillSourceId: "well-7", metal: "copper", firstOpeningAt: day(-10), lastOpeningAt: day(5), poolIds: ["p1", "p2", "p3"], activePools: 6, poolsRequired: 3 },
        { fillSourceId: "well-7", metal: "iron", firstOpeningAt: day(-10), lastOpeningAt: day(5), poolIds: ["p1", "p2", "p3"], activePools: 6, poolsRequired: 3 },
      ],
      balance: [
        { takenAt: day(-70), saturationIndex: -0.9 }, // outside the 60 days
        { takenAt: day(-30), saturationIndex: -0.5 },
        { takenAt: day(-7), saturationIndex: -0.2 },
      ],
      treatments: [{ poolId: "p1", category: "copper-algaecide", appliedAt: day(-20), productId: "alg" }],
    });
    expect(evidence.map((e) => e.kind)).toEqual([
      "fill-water-test",
      "shared-source-alert",
      "ageing-copper-exchanger-with-corrosive-water",
      "copper-algaecide",
    ]);
    expect(evidence[0]!.reason).toBe("Fill water tested 0.45 mg/L copper on 2024-03-23, at or above the elevated level 0.3 mg/L.");
    expect(evidence[2]!.reason).toContain("cupronickel heat exchanger 12 years old");
    expect(evidence[2]!.reason).toContain("lowest saturation index -0.50 on 2024-06-01");
    for (const e of evidence) expect(e.reason.length).toBeGreaterThan(20);
  });

  it("an old exchanger without corrosive water, or a young one, is not evidence", () => {
    const balanced = likelySourceEvidence({ pool, metal: "copper", onsetAt: onset, balance: [{ takenAt: day(-5), saturationIndex: 0.1 }] });
    expect(balanced).toEqual([]);
    const young = likelySourceEvidence({
      pool: { ...pool, equipment: [{ id: "h", kind: "heater", exchangerMetal: "copper", installedAt: Date.UTC(2016, 0, 1) }] },
      metal: "copper",
      onsetAt: onset,
      balance: [{ takenAt: day(-5), saturationIndex: -1 }],
    });
    expect(young).toEqual([]);
  });

  it("iron on a well; ioniser for copper; nothing for manganese on city water", () => {
    expect(likelySourceEvidence({ pool, metal: "iron", onsetAt: onset }).map((e) => e.kind)).toEqual(["iron-with-well-water"]);
    const ioniserPool: PoolProfile = { poolId: "p9", fillSourceKind: "municipal", sanitiser: "mineral-ioniser-assist" };
    expect(likelySourceEvidence({ pool: ioniserPool, metal: "copper", onsetAt: onset }).map((e) => e.kind)).toEqual(["ioniser"]);
    expect(likelySourceEvidence({ pool: ioniserPool, metal: "manganese", onsetAt: onset })).toEqual([]);
  });
});
