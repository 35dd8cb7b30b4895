import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DAY_MS, analyseMetalHistory, openSuspicions, type MetalTest } from "./episodes";
import { DEFAULT_METAL_THRESHOLDS, metalStatus, type Metal, type MetalReading } from "./reading";

const T0 = Date.UTC(2024, 0, 1);
const day = (n: number) => T0 + n * DAY_MS;
const r = (value: number): MetalReading => ({ value, belowDetection: false });
const lt = (value: number): MetalReading => ({ value, belowDetection: true });

function series(poolId: string, metal: Metal, points: Array<[dayNumber: number, reading: MetalReading | null]>): MetalTest[] {
  return points.map(([d, reading], i) => ({ id: `${poolId}-${i}`, poolId, takenAt: day(d), [metal]: reading }));
}

describe("episodes: hand-made scenarios", () => {
  it("copper with hysteresis, a below-detection close and a censored tail", () => {
    // copper, thresholds 0.3 elevated / 0.1 clear:
    // day 0   0.05  clear          -> nothing open
    // day 7   0.35  elevated       -> episode 1 opens (day 7)
    // day 14  0.20  watch          -> stays open
    // day 21  0.12  watch          -> stays open
    // day 28  <0.05 clear (limit 0.05 <= 0.1) -> episode 1 closes on day 28, 21 days long
    // day 35  0.25  watch          -> nothing opens (below elevated)
    // day 42  0.40  elevated       -> episode 2 opens, 35 days after the first opening: recurrence
    // day 49  <0.2  unknown        -> stays open
    // day 56  (not tested)         -> stays open
    // end of data at day 56: episode 2 censored, 14 days observed, not chronic
    const h = analyseMetalHistory(
      series("p1", "copper", [[0, r(0.05)], [7, r(0.35)], [14, r(0.2)], [21, r(0.12)], [28, lt(0.05)], [35, r(0.25)], [42, r(0.4)], [49, lt(0.2)], [56, null]]),
    );
    expect(h.episodes.map((e) => [e.openedAt, e.closedAt, e.censored, e.durationDays, e.peak, e.recurrence])).toEqual([
      [day(7), day(28), false, 21, 0.35, false],
      [day(42), null, true, 14, 0.4, true],
    ]);
    expect(h.episodes[0]!.testCount).toBe(4);
    expect(h.recurrence).toEqual([{ poolId: "p1", metal: "copper", openings: 2, recurrent: true, firstRecurrenceAt: day(42) }]);
    expect(h.pools).toEqual([{ poolId: "p1", firstTestAt: day(0), lastTestAt: day(56), tests: 9 }]);
  });

  it("chronic episode and openings more than 365 days apart", () => {
    // iron, 0.2 elevated / 0.1 clear:
    // day 0 0.3 opens; day 30 0.25, day 61 0.15 keep it open; day 62 0.05 closes -> 62 days, chronic (> 60)
    // day 400 0.2 opens again: 400 days after the first opening -> not a recurrence
    // day 420 0.0 closes -> 20 days, not chronic
    const h = analyseMetalHistory(
      series("p2", "iron", [[0, r(0.3)], [30, r(0.25)], [61, r(0.15)], [62, r(0.05)], [400, r(0.2)], [420, r(0)]]),
    );
    expect(h.episodes.map((e) => [e.durationDays, e.chronic, e.recurrence])).toEqual([
      [62, true, false],
      [20, false, false],
    ]);
    expect(h.recurrence[0]).toMatchObject({ openings: 2, recurrent: false, firstRecurrenceAt: null });
  });

  it("exactly 60 days is not chronic, exactly 365 days apart is a recurrence", () => {
    // manganese 0.05 / 0.02: open day 0, close day 60 (60 days, not > 60); open again day 365 (gap 365 <= 365)
    const h = analyseMetalHistory(series("p3", "manganese", [[0, r(0.05)], [60, r(0.01)], [365, r(0.08)]]));
    expect(h.episodes.map((e) => [e.chronic, e.recurrence, e.censored])).toEqual([
      [false, false, false],
      [false, true, true],
    ]);
    const stricter = analyseMetalHistory(series("p3", "manganese", [[0, r(0.05)], [60, r(0.01)], [365, r(0.08)]]), {
      recurrenceWindowDays: 364,
      chronicAfterDays: 59,
    });
    expect(stricter.episodes.map((e) => [e.chronic, e.recurrence])).toEqual([
      [true, false],
      [false, false],
    ]);
  });

  it("metals are tracked separately and company thresholds apply", () => {
    const tests: MetalTest[] = [
      { id: "a", poolId: "p", takenAt: day(0), copper: r(0.25), iron: r(0.3) },
      { id: "b", poolId: "p", takenAt: day(7), copper: r(0.05), iron: r(0.15) },
    ];
    // Default: copper 0.25 is only "watch", iron opens at day 0 and stays open (0.15 is not below 0.1).
    const defaults = analyseMetalHistory(tests);
    expect(defaults.episodes.map((e) => [e.metal, e.censored])).toEqual([["iron", true]]);
    // Copper elevated at 0.25: copper opens day 0 and closes day 7.
    const custom = analyseMetalHistory(tests, { thresholds: { ...DEFAULT_METAL_THRESHOLDS, copper: { elevated: 0.25, clear: 0.1 } } });
    expect(custom.episodes.map((e) => [e.metal, e.censored]).sort()).toEqual([["copper", false], ["iron", true]]);
  });
});

describe("metal suspected from a blurred hardness endpoint", () => {
  it("raises on a blurred endpoint without metal readings and clears on the next metal reading", () => {
    // day 0 blurred, no metals        -> suspicion raised
    // day 7 blurred again, no metals  -> same suspicion, 2 blurred tests
    // day 14 clean, no metals         -> still suspected
    // day 21 iron read                -> resolved on day 21
    // day 28 blurred with copper read -> no new suspicion (a metal was measured)
    // day 35 blurred, no metals       -> new suspicion, open at the end
    const tests: MetalTest[] = [
      { id: "t0", poolId: "p", takenAt: day(0), hardnessEndpoint: "blurred" },
      { id: "t1", poolId: "p", takenAt: day(7), hardnessEndpoint: "blurred" },
      { id: "t2", poolId: "p", takenAt: day(14), hardnessEndpoint: "clean" },
      { id: "t3", poolId: "p", takenAt: day(21), iron: r(0.05) },
      { id: "t4", poolId: "p", takenAt: day(28), hardnessEndpoint: "blurred", copper: r(0.1) },
      { id: "t5", poolId: "p", takenAt: day(35), hardnessEndpoint: "blurred" },
    ];
    const h = analyseMetalHistory(tests);
    expect(h.suspicions).toEqual([
      { poolId: "p", raisedAt: day(0), raisedByTestId: "t0", resolvedAt: day(21), resolvedByTestId: "t3", blurredTests: 2 },
      { poolId: "p", raisedAt: day(35), raisedByTestId: "t5", resolvedAt: null, resolvedByTestId: null, blurredTests: 1 },
    ]);
    expect(openSuspicions(h).map((s) => s.raisedByTestId)).toEqual(["t5"]);
  });
});

// ---------------------------------------------------------------------------
// Properties over random histories

const metalValue = fc.oneof(
  fc.constant(null),
  fc.integer({ min: 0, max: 60 }).map((n) => r(n / 100)),
  fc.constantFrom(0.05, 0.1, 0.2, 0.5).map(lt),
);
const randomTests = fc
  .array(
    fc.record({
      pool: fc.integer({ min: 0, max: 4 }),
      dayNumber: fc.integer({ min: 0, max: 900 }),
      copper: metalValue,
      iron: metalValue,
      blurred: fc.boolean(),
    }),
    { maxLength: 120 },
  )
  .map((rows) =>
    rows.map<MetalTest>((row, i) => ({
      id: `t${i}`,
      poolId: `pool-${row.pool}`,
      takenAt: day(row.dayNumber) + i, // distinct times keep "first later test" unambiguous
      copper: row.copper,
      iron: row.iron,
      hardnessEndpoint: row.blurred ? "blurred" : "clean",
    })),
  );

describe("episode properties", () => {
  it("episodes of one pool and metal never overlap and follow the open/close rule", () => {
    fc.assert(
      fc.property(randomTests, (tests) => {
        const h = analyseMetalHistory(tests);
        const byId = new Map(tests.map((t) => [t.id, t]));
        const keyed = new Map<string, typeof h.episodes>();
        for (const e of h.episodes) {
          const key = `${e.poolId}/${e.metal}`;
          keyed.set(key, [...(keyed.get(key) ?? []), e]);
        }
        for (const [key, list] of keyed) {
          const [poolId, metal] = key.split("/") as [string, Metal];
          for (let i = 1; i < list.length; i++) expect(list[i]!.openedAt).toBeGreaterThan(list[i - 1]!.endAt);
          expect(list.filter((e) => e.censored).length).toBeLessThanOrEqual(1);
          if (list.some((e) => e.censored)) expect(list[list.length - 1]!.censored).toBe(true);
          const levels = DEFAULT_METAL_THRESHOLDS[metal];
          const poolTests = tests.filter((t) => t.poolId === poolId).sort((a, b) => a.takenAt - b.takenAt);
          for (const e of list) {
            expect(metalStatus(byId.get(e.openedByTestId)![metal]!, levels)).toBe("elevated");
            if (e.closedByTestId) expect(metalStatus(byId.get(e.closedByTestId)![metal]!, levels)).toBe("clear");
            // no clear reading strictly inside an episode
            for (const t of poolTests) {
              if (t.takenAt > e.openedAt && t.takenAt < e.endAt && t[metal]) {
                expect(metalStatus(t[metal]!, levels)).not.toBe("clear");
              }
            }
          }
          // every elevated reading lies inside some episode
          for (const t of poolTests) {
            const reading = t[metal];
            if (reading && metalStatus(reading, levels) === "elevated") {
              expect(list.some((e) => t.takenAt >= e.openedAt && t.takenAt <= e.endAt)).toBe(true);
            }
          }
        }
      }),
    );
  });

  it("input order does not matter", () => {
    fc.assert(
      fc.property(randomTests, fc.integer(), (tests, seed) => {
        const shuffled = [...tests].sort((a, b) => ((a.takenAt * 31 + seed) % 97) - ((b.takenAt * 31 + seed) % 97));
        const key = (h: ReturnType<typeof analyseMetalHistory>) =>
          JSON.stringify([...h.episodes].sort((a, b) => (a.poolId + a.metal + a.openedAt < b.poolId + b.metal + b.openedAt ? -1 : 1)));
        expect(key(analyseMetalHistory(shuffled))).toBe(key(analyseMetalHistory(tests)));
      }),
    );
  });

  it("recurrence agrees with the openings' spacing", () => {
    fc.assert(
      fc.property(randomTests, (tests) => {
        const h = analyseMetalHistory(tests);
        for (const finding of h.recurrence) {
          const openings = h.episodes
            .filter((e) => e.poolId === finding.poolId && e.metal === finding.metal)
            .map((e) => e.openedAt);
          expect(openings.length).toBe(finding.openings);
          const anyPair = openings.some((t, i) => openings.some((u, j) => i !== j && Math.abs(t - u) <= 365 * DAY_MS));
          expect(finding.recurrent).toBe(anyPair);
        }
      }),
    );
  });
});
