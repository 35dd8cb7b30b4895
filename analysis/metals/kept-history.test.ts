import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { DAY_MS, analyseMetalHistory, type MetalTest } from "./episodes";
import { READ_AS, episodesReadAs, historyFromKept, type KeptInputTest, keptRowsOf, metalsReadAs, testsReadAs } from "./kept-history";
import { DEFAULT_METAL_THRESHOLDS, type MetalReading } from "./reading";

const T0 = Date.UTC(2023, 0, 1);

const reading = fc.option(
  fc.record({ value: fc.constantFrom(0.02, 0.05, 0.1, 0.15, 0.2, 0.3, 0.35, 0.5, 0.8, 1.2), belowDetection: fc.boolean() }),
  { nil: null, freq: 2 },
) as fc.Arbitrary<MetalReading | null>;

/** Tests of a few pools, ordered by pool and time as the database returns them; some have no metal at all. */
const poolTests = fc
  .array(
    fc.record({ pool: fc.integer({ min: 1, max: 4 }), day: fc.integer({ min: 0, max: 900 }), copper: reading, iron: reading, manganese: reading }),
    { maxLength: 120 },
  )
  .map((rows) =>
    rows
      .sort((a, b) => a.pool - b.pool || a.day - b.day)
      .map((r, i): MetalTest => ({ id: String(i + 1), poolId: String(r.pool), takenAt: T0 + r.day * DAY_MS, copper: r.copper, iron: r.iron, manganese: r.manganese })),
  );

describe("kept rows rebuild the metal history", () => {
  it("for every reading, the history rebuilt from kept rows equals the analysis of the tests read that way", () => {
    fc.assert(
      fc.property(poolTests, (tests) => {
        const kept = keptRowsOf(tests, DEFAULT_METAL_THRESHOLDS);
        for (const readAs of READ_AS) {
          const metals = metalsReadAs(readAs);
          const expected = analyseMetalHistory(testsReadAs(tests, readAs), { thresholds: DEFAULT_METAL_THRESHOLDS, metals });
          const episodes = episodesReadAs(kept.episodes, readAs);
          const spans = kept.spans.filter((s) => s.readAs === readAs).map(({ readAs: _r, ...s }) => s);
          expect(historyFromKept(episodes, spans, metals)).toEqual({ ...expected, suspicions: [] });
        }
      }),
      { numRuns: 300 },
    );
  });

  it("keeps a metal's own rows only where reading it alone finds other episodes than the all-metals reading", () => {
    // Pool 1 reads copper and iron at every test: copper alone finds the same episode, kept once.
    // Pool 2 reads iron at one test in two: the iron episode read alone counts fewer tests, so it is kept apart.
    const tests: KeptInputTest[] = [
      { id: "1", poolId: "1", takenAt: T0, copper: { value: 0.6, belowDetection: false }, iron: { value: 0.05, belowDetection: false } },
      { id: "2", poolId: "1", takenAt: T0 + DAY_MS, copper: { value: 0.05, belowDetection: false }, iron: { value: 0.05, belowDetection: false } },
      { id: "3", poolId: "2", takenAt: T0, copper: { value: 0.05, belowDetection: false }, iron: { value: 0.5, belowDetection: false } },
      { id: "4", poolId: "2", takenAt: T0 + DAY_MS, copper: { value: 0.05, belowDetection: false } },
      { id: "5", poolId: "2", takenAt: T0 + 2 * DAY_MS, copper: { value: 0.05, belowDetection: false }, iron: { value: 0.05, belowDetection: false } },
    ];
    const kept = keptRowsOf(tests, DEFAULT_METAL_THRESHOLDS).episodes.map((e) => [e.readAs, e.poolId, e.metal, e.alone, e.testCount]);
    expect(kept).toEqual([
      ["all", "1", "copper", true, 2],
      ["all", "2", "iron", false, 3],
      ["iron", "2", "iron", false, 2],
    ]);
  });

  it("keeps each pool's span of every test, metal or not", () => {
    const tests: KeptInputTest[] = [
      { id: "1", poolId: "7", takenAt: T0, copper: null, balanceComplete: true },
      { id: "2", poolId: "7", takenAt: T0 + DAY_MS, copper: { value: 0.5, belowDetection: false } },
      { id: "3", poolId: "7", takenAt: T0 + 9 * DAY_MS },
    ];
    const spans = keptRowsOf(tests, DEFAULT_METAL_THRESHOLDS).spans;
    // three tests in all from day 0 to day 9, the one on day 0 with every balance input; one copper test, on day 1
    expect(spans.find((s) => s.readAs === "any")).toEqual({
      readAs: "any",
      poolId: "7",
      firstTestAt: T0,
      lastTestAt: T0 + 9 * DAY_MS,
      tests: 3,
      latestBalanceAt: T0,
      latestBalanceTestId: "1",
    });
    expect(spans.find((s) => s.readAs === "copper")).toEqual({ readAs: "copper", poolId: "7", firstTestAt: T0 + DAY_MS, lastTestAt: T0 + DAY_MS, tests: 1 });
    expect(spans.find((s) => s.readAs === "iron")).toBeUndefined();
  });

  it("names the last entered of two complete tests at one instant as the pool's latest balance test", () => {
    const tests: KeptInputTest[] = [
      { id: "11", poolId: "7", takenAt: T0, balanceComplete: true },
      { id: "12", poolId: "7", takenAt: T0 + DAY_MS, balanceComplete: true },
      { id: "14", poolId: "7", takenAt: T0 + DAY_MS, balanceComplete: true },
      { id: "15", poolId: "7", takenAt: T0 + DAY_MS, balanceComplete: false },
    ];
    const any = keptRowsOf(tests, DEFAULT_METAL_THRESHOLDS).spans.find((s) => s.readAs === "any");
    expect([any?.latestBalanceAt, any?.latestBalanceTestId]).toEqual([T0 + DAY_MS, "14"]);
  });
});
