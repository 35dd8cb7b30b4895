import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { MetalTest } from "./episodes";
import { keptMonthsOf, localDayOf, metalsOfMonth, monthValueChanges, summedMonthValueChanges, type KeptPoolMonth } from "./kept-months";
import { DEFAULT_METAL_THRESHOLDS, METALS, type MetalReading } from "./reading";

const T0 = Date.UTC(2023, 0, 1);

const reading = fc.option(fc.record({ value: fc.constantFrom(0.02, 0.05, 0.1, 0.15, 0.2, 0.3, 0.5, 1.2), belowDetection: fc.boolean() }), {
  nil: null,
  freq: 2,
}) as fc.Arbitrary<MetalReading | null>;

const testRows = fc.array(
  fc.record({
    pool: fc.integer({ min: 1, max: 4 }),
    hour: fc.integer({ min: 0, max: 24 * 400 }),
    copper: reading,
    iron: reading,
    manganese: reading,
  }),
  { maxLength: 80 },
);

function asTests(
  rows: ReadonlyArray<{ pool: number; hour: number; copper: MetalReading | null; iron: MetalReading | null; manganese: MetalReading | null }>,
  firstId = 1,
): MetalTest[] {
  return [...rows]
    .sort((a, b) => a.pool - b.pool || a.hour - b.hour)
    .map((r, i) => ({
      id: String(firstId + i),
      poolId: String(r.pool),
      takenAt: T0 + r.hour * 3_600_000,
      copper: r.copper,
      iron: r.iron,
      manganese: r.manganese,
    }));
}

/** The company's month histogram as a map, counting every pool-month row's values. */
function histogramOf(rows: readonly KeptPoolMonth[]): Map<string, number> {
  const counts = new Map<string, number>();
  for (const row of rows)
    for (const [metal, month] of metalsOfMonth(row))
      for (const v of month.values) {
        const key = `${metal}/${row.month}/${v.value}/${v.belowDetection}`;
        counts.set(key, (counts.get(key) ?? 0) + v.n);
      }
  return counts;
}

describe("local days of a time zone", () => {
  // Offsets from the IANA time zone database: New York UTC-5 in winter and UTC-4 in summer (daylight saving from the
  // second Sunday of March); Kolkata UTC+5:30 all year; Kathmandu UTC+5:45.
  it.each([
    ["America/New_York", "2024-03-01T03:30:00Z", "2024-02-29"],
    ["America/New_York", "2024-07-01T03:30:00Z", "2024-06-30"],
    ["America/New_York", "2024-07-01T04:30:00Z", "2024-07-01"],
    ["Asia/Kolkata", "2024-01-31T18:15:00Z", "2024-01-31"],
    ["Asia/Kolkata", "2024-01-31T18:45:00Z", "2024-02-01"],
    ["Asia/Kathmandu", "2024-01-31T18:14:00Z", "2024-01-31"],
    ["Asia/Kathmandu", "2024-01-31T18:16:00Z", "2024-02-01"],
    ["UTC", "2024-12-31T23:59:59Z", "2024-12-31"],
  ])("in %s, %s falls on %s", (zone, instant, day) => {
    const dayOf = localDayOf(zone);
    // Asked twice: the second answer comes from the hour's cache where there is one.
    expect(dayOf(Date.parse(instant))).toBe(day);
    expect(dayOf(Date.parse(instant))).toBe(day);
  });
});

describe("kept pool months", () => {
  it("count one pool's readings per local month and metal, the elevated ones, and the days with a metal reading", () => {
    const at = (iso: string) => Date.parse(iso);
    const cu = (value: number, belowDetection = false) => ({ value, belowDetection });
    const tests: MetalTest[] = [
      // 22:30 on 29 February in New York: February there, March in UTC.
      { id: "1", poolId: "7", takenAt: at("2024-03-01T03:30:00Z"), copper: cu(0.5), iron: cu(0.1, true) },
      { id: "2", poolId: "7", takenAt: at("2024-03-05T15:00:00Z"), copper: cu(0.1) },
      { id: "3", poolId: "7", takenAt: at("2024-03-05T16:00:00Z"), copper: cu(0.1) },
      { id: "4", poolId: "7", takenAt: at("2024-03-20T15:00:00Z"), copper: cu(1, true) },
      // No metal measured: not a day of any month row.
      { id: "5", poolId: "7", takenAt: at("2024-03-21T15:00:00Z") },
    ];
    expect(keptMonthsOf(tests, DEFAULT_METAL_THRESHOLDS, "America/New_York")).toEqual([
      {
        poolId: "7",
        month: "2024-02",
        days: 1,
        metals: {
          copper: { readings: 1, elevated: 1, values: [{ value: 0.5, belowDetection: false, n: 1 }] },
          iron: { readings: 1, elevated: 0, values: [{ value: 0.1, belowDetection: true, n: 1 }] },
        },
      },
      {
        poolId: "7",
        month: "2024-03",
        days: 2,
        metals: {
          copper: {
            readings: 3,
            // A "<1" reading is below detection, never at or above the level.
            elevated: 0,
            values: [
              { value: 0.1, belowDetection: false, n: 2 },
              { value: 1, belowDetection: true, n: 1 },
            ],
          },
        },
      },
    ]);
  });

  it("hold every reading once, and the company's histogram kept by changes pool by pool equals the one counted from every test", () => {
    fc.assert(
      fc.property(testRows, testRows, fc.constantFrom("UTC", "America/New_York", "Asia/Kolkata"), (first, second, zone) => {
        const before = asTests(first);
        const rows = keptMonthsOf(before, DEFAULT_METAL_THRESHOLDS, zone);
        const readingCount = before.reduce((sum, t) => sum + METALS.filter((m) => t[m]).length, 0);
        const metalMonths = rows.flatMap(metalsOfMonth).map(([, month]) => month);
        expect(metalMonths.reduce((sum, m) => sum + m.readings, 0)).toBe(readingCount);
        expect(metalMonths.every((m) => m.values.reduce((sum, v) => sum + v.n, 0) === m.readings && m.elevated <= m.readings)).toBe(true);
        // A month row has a day for each local day with a metal reading: at least one, never more than its readings.
        expect(rows.every((r) => r.days >= 1 && r.days <= metalsOfMonth(r).reduce((sum, [, m]) => sum + m.readings, 0))).toBe(true);
        expect(new Set(rows.map((r) => `${r.poolId}/${r.month}`)).size).toBe(rows.length);
        expect(rows.every((r) => JSON.stringify(Object.keys(r.metals)) === JSON.stringify(metalsOfMonth(r).map(([metal]) => metal)))).toBe(true);

        // Keep the histogram as writes do: pools added one at a time, then each pool's tests replaced by the second set's.
        const histogram = new Map<string, number>();
        const apply = (old: readonly KeptPoolMonth[], now: readonly KeptPoolMonth[]) => {
          for (const c of monthValueChanges(old, now)) {
            const key = `${c.metal}/${c.month}/${c.value}/${c.belowDetection}`;
            histogram.set(key, (histogram.get(key) ?? 0) + c.n);
          }
        };
        const after = asTests(second, 1000);
        const poolsOf = (tests: MetalTest[]) => new Set(tests.map((t) => t.poolId));
        const monthsOf = (tests: MetalTest[], pool: string) =>
          keptMonthsOf(
            tests.filter((t) => t.poolId === pool),
            DEFAULT_METAL_THRESHOLDS,
            zone,
          );
        for (const pool of poolsOf(before)) apply([], monthsOf(before, pool));
        for (const pool of new Set([...poolsOf(before), ...poolsOf(after)])) apply(monthsOf(before, pool), monthsOf(after, pool));
        const kept = new Map([...histogram].filter(([, n]) => n !== 0));
        expect(kept).toEqual(histogramOf(keptMonthsOf(after, DEFAULT_METAL_THRESHOLDS, zone)));
        expect([...histogram.values()].every((n) => n >= 0)).toBe(true);
      }),
      { numRuns: 300 },
    );
  });

  it("sum the changes of several slices of pools into the changes of all of them at once", () => {
    fc.assert(
      fc.property(testRows, testRows, fc.integer({ min: 1, max: 4 }), (first, second, slices) => {
        const before = asTests(first);
        const after = asTests(second);
        const pools = [...new Set([...before, ...after].map((t) => t.poolId))].sort();
        const monthsOf = (tests: MetalTest[], some: readonly string[]) =>
          keptMonthsOf(
            tests.filter((t) => some.includes(t.poolId)),
            DEFAULT_METAL_THRESHOLDS,
            "UTC",
          );
        const parts = Array.from({ length: slices }, (_, k) => pools.filter((_, i) => i % slices === k)).map((some) =>
          monthValueChanges(monthsOf(before, some), monthsOf(after, some)),
        );
        expect(summedMonthValueChanges(parts)).toEqual(monthValueChanges(monthsOf(before, pools), monthsOf(after, pools)));
      }),
      { numRuns: 200 },
    );
    // A value counted out by one slice and in by another is no change at all.
    const one = { metal: "iron" as const, month: "2024-05", value: 0.3, belowDetection: false };
    expect(summedMonthValueChanges([[{ ...one, n: -1 }], [{ ...one, n: 1 }]])).toEqual([]);
  });

  it("list a histogram's changes in metal, month and value order", () => {
    const row = (month: string, value: number, metal: "copper" | "iron" = "iron"): KeptPoolMonth => ({
      poolId: "1",
      month,
      days: 1,
      metals: { [metal]: { readings: 1, elevated: 0, values: [{ value, belowDetection: false, n: 1 }] } },
    });
    const changes = monthValueChanges([row("2024-05", 0.3)], [row("2024-05", 0.1), row("2024-04", 0.2), row("2024-01", 0.4, "copper")]);
    expect(changes.map((c) => `${c.metal} ${c.month} ${c.value} ${c.n}`)).toEqual([
      "copper 2024-01 0.4 1",
      "iron 2024-04 0.2 1",
      "iron 2024-05 0.1 1",
      "iron 2024-05 0.3 -1",
    ]);
  });
});
