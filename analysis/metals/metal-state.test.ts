import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DAY_MS, analyseMetalHistory, type MetalTest } from "./episodes";
import { testsReadAs } from "./kept-history";
import { poolMetalStates } from "./metal-state";
import { DEFAULT_METAL_THRESHOLDS, METALS, metalStatus, type MetalReading } from "./reading";

const T0 = Date.UTC(2024, 0, 1);

// Values around each default level (copper 0.3/0.1, iron 0.2/0.1, manganese 0.05/0.02): clear, between, elevated, and "<x" on both sides of clear.
const reading = fc.option(
  fc.record({ value: fc.constantFrom(0.01, 0.02, 0.03, 0.05, 0.1, 0.15, 0.2, 0.3, 0.5), belowDetection: fc.boolean() }),
  { nil: null, freq: 2 },
) as fc.Arbitrary<MetalReading | null>;

/** Tests of a few pools ordered by pool, time and id; days repeat, so tests share an instant. */
const poolTests = fc
  .array(fc.record({ pool: fc.integer({ min: 1, max: 3 }), day: fc.integer({ min: 0, max: 40 }), copper: reading, iron: reading, manganese: reading }), {
    maxLength: 80,
  })
  .map((rows) =>
    rows
      .sort((a, b) => a.pool - b.pool || a.day - b.day)
      .map((r, i): MetalTest => ({ id: String(i + 1), poolId: String(r.pool), takenAt: T0 + r.day * DAY_MS, copper: r.copper, iron: r.iron, manganese: r.manganese })),
  );

/** The rule the source health page used before: open when the last elevated reading is later in time than the last clear one. */
function openByTimeComparison(tests: readonly MetalTest[], poolId: string, metal: (typeof METALS)[number]): boolean {
  let elevated: number | null = null;
  let clear: number | null = null;
  for (const t of tests) {
    const r = t[metal];
    if (t.poolId !== poolId || !r) continue;
    const status = metalStatus(r, DEFAULT_METAL_THRESHOLDS[metal]);
    if (status === "clear") clear = t.takenAt;
    else if (status === "elevated") elevated = t.takenAt;
  }
  return elevated !== null && (clear === null || elevated > clear);
}

describe("a pool's metal state", () => {
  it("is open exactly when the episode analysis of that metal read alone leaves an episode open, and last tested at its last reading", () => {
    fc.assert(
      fc.property(poolTests, (tests) => {
        const states = poolMetalStates(tests, DEFAULT_METAL_THRESHOLDS);
        for (const metal of METALS) {
          const history = analyseMetalHistory(testsReadAs(tests, metal), { thresholds: DEFAULT_METAL_THRESHOLDS, metals: [metal] });
          const openPools = new Set(history.episodes.filter((e) => e.censored).map((e) => e.poolId));
          const lastTested = new Map(history.pools.map((p) => [p.poolId, p.lastTestAt]));
          for (const poolId of new Set(tests.map((t) => t.poolId))) {
            const state = states.get(poolId)![metal];
            const expected = !lastTested.has(poolId) ? "not-tested" : openPools.has(poolId) ? "open" : "clear";
            expect(state.state).toBe(expected);
            expect(state.lastTestedAt).toBe(lastTested.get(poolId) ?? null);
          }
        }
      }),
      { numRuns: 500 },
    );
  });

  it("follows the time comparison it replaces whenever no two tests of a pool share an instant", () => {
    fc.assert(
      fc.property(poolTests, (tests) => {
        const seen = new Set<string>();
        const distinct = tests.filter((t) => !seen.has(`${t.poolId}@${t.takenAt}`) && seen.add(`${t.poolId}@${t.takenAt}`));
        const states = poolMetalStates(distinct, DEFAULT_METAL_THRESHOLDS);
        for (const [poolId, state] of states) {
          for (const metal of METALS) {
            if (state[metal].state !== "not-tested") expect(state[metal].state === "open").toBe(openByTimeComparison(distinct, poolId, metal));
          }
        }
      }),
      { numRuns: 500 },
    );
  });

  it("counts the later test of two taken at one instant, as the episodes do (where the time comparison said clear)", () => {
    const at = T0 + 3 * DAY_MS;
    const tests: MetalTest[] = [
      { id: "1", poolId: "7", takenAt: T0, iron: { value: 0.05, belowDetection: false } },
      { id: "2", poolId: "7", takenAt: at, iron: { value: 0.05, belowDetection: false } },
      { id: "3", poolId: "7", takenAt: at, iron: { value: 0.4, belowDetection: false } },
    ];
    expect(poolMetalStates(tests, DEFAULT_METAL_THRESHOLDS).get("7")!.iron).toEqual({ state: "open", lastTestedAt: at });
    expect(analyseMetalHistory(tests, { metals: ["iron"] }).episodes.map((e) => e.censored)).toEqual([true]);
    expect(openByTimeComparison(tests, "7", "iron")).toBe(false);
  });
});
