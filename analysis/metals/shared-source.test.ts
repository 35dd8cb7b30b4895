import { describe, expect, it } from "vitest";
import { DAY_MS, type Episode } from "./episodes";
import type { Metal } from "./reading";
import type { PoolProfile } from "./route-book";
import { sharedSourceAlerts } from "./shared-source";

const T0 = Date.UTC(2024, 4, 1);
const day = (n: number) => T0 + n * DAY_MS;

function opening(poolId: string, d: number, metal: Metal = "iron"): Episode {
  return {
    poolId, metal, openedAt: day(d), openedByTestId: `${poolId}-${d}`, closedAt: null, closedByTestId: null,
    censored: true, endAt: day(d), durationDays: 0, peak: 0.3, testCount: 1, chronic: false, recurrence: false,
  };
}

const wellPools: PoolProfile[] = Array.from({ length: 8 }, (_, i) => ({ poolId: `w${i}`, fillSourceId: "well-A", fillSourceKind: "shared-well" }));
const cityPools: PoolProfile[] = Array.from({ length: 20 }, (_, i) => ({ poolId: `c${i}`, fillSourceId: "city", fillSourceKind: "municipal" }));

describe("shared-source alerts", () => {
  it("three pools on an 8-pool well opening iron within 21 days", () => {
    // well-A has 8 pools: needs max(3, ceil(0.25 x 8) = 2) = 3 pools.
    // w0 day 0, w1 day 10, w2 day 21 -> window day 0..21 holds 3 pools -> alert day 0 to day 21.
    // w3 day 40: window 19..40 holds w2 and w3 only -> no extension.
    const alerts = sharedSourceAlerts([opening("w0", 0), opening("w1", 10), opening("w2", 21), opening("w3", 40)], [...wellPools, ...cityPools]);
    expect(alerts).toEqual([
      { fillSourceId: "well-A", metal: "iron", firstOpeningAt: day(0), lastOpeningAt: day(21), poolIds: ["w0", "w1", "w2"], activePools: 8, poolsRequired: 3 },
    ]);
  });

  it("22 days apart is too far; the same pool twice counts once", () => {
    // w0 day 0, w1 day 10, w2 day 22: no window of 21 days holds three pools.
    expect(sharedSourceAlerts([opening("w0", 0), opening("w1", 10), opening("w2", 22)], wellPools)).toEqual([]);
    expect(sharedSourceAlerts([opening("w0", 0), opening("w0", 5), opening("w1", 10)], wellPools)).toEqual([]);
  });

  it("a quarter of active pools is required on a large source", () => {
    // city has 20 pools: needs max(3, ceil(0.25 x 20) = 5) = 5 pools.
    const four = ["c0", "c1", "c2", "c3"].map((p, i) => opening(p, i));
    expect(sharedSourceAlerts(four, cityPools)).toEqual([]);
    const five = [...four, opening("c4", 6)];
    expect(sharedSourceAlerts(five, cityPools).map((a) => a.poolIds.length)).toEqual([5]);
    // The company can say only 12 pools are active now: ceil(0.25 x 12) = 3 -> 3 pools suffice.
    expect(sharedSourceAlerts(four.slice(0, 3), cityPools, { activePools: new Map([["city", 12]]) })).toHaveLength(1);
  });

  it("metals are separate, overlapping windows merge, separate waves stay separate", () => {
    // copper on w0, w1 and iron on w2 within days: neither metal reaches 3 pools.
    expect(sharedSourceAlerts([opening("w0", 0, "copper"), opening("w1", 1, "copper"), opening("w2", 2)], wellPools)).toEqual([]);
    // Wave 1: w0 0, w1 5, w2 10, w3 25 (window 5..25 holds w1 w2 w3 -> same alert, extended to day 25).
    // Wave 2: w4 200, w5 201, w6 202 -> a second alert.
    const alerts = sharedSourceAlerts(
      [opening("w0", 0), opening("w1", 5), opening("w2", 10), opening("w3", 25), opening("w4", 200), opening("w5", 201), opening("w6", 202)],
      wellPools,
      { rules: { minPools: 3 } },
    );
    expect(alerts.map((a) => [a.firstOpeningAt, a.lastOpeningAt, a.poolIds])).toEqual([
      [day(0), day(25), ["w0", "w1", "w2", "w3"]],
      [day(200), day(202), ["w4", "w5", "w6"]],
    ]);
  });
});
