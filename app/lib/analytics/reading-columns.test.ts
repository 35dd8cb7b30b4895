import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { analyseMetalHistory, DAY_MS, type MetalHistory, type MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { decodeReadingColumns, decodeTreatmentColumns, encodeReadingColumns, encodeTreatmentColumns } from "./reading-columns";
import { findRecurring } from "@analysis/metals/recurring-finder";

const at = (day: number) => Date.parse("2025-01-01T10:00:00.123Z") + day * DAY_MS;
const floor = { copper: 0.3, iron: 0.2, manganese: 0.05 };

describe("metal readings as per-pool columns", () => {
  const tests: MetalTest[] = [
    { id: "a", poolId: "7", takenAt: at(0), iron: { value: 0.05, belowDetection: false }, copper: { value: 0.05, belowDetection: true } },
    { id: "b", poolId: "7", takenAt: at(7) + 451, iron: { value: 0.4, belowDetection: false }, copper: null },
    { id: "c", poolId: "7", takenAt: at(14), copper: { value: 0.1, belowDetection: false } },
    { id: "d", poolId: "9", takenAt: at(3), manganese: { value: 0.06, belowDetection: false } },
  ];

  it("sends a start, the gapsMs in ms and thousandths of mg/L, negative for a detection limit", () => {
    expect(encodeReadingColumns(tests, METALS, floor)).toEqual([
      // Pool 7: gapsMs 7 d + 451 ms = 604,800,451 ms, then 7 d - 451 ms = 604,799,549 ms.
      // Iron reaches 0.2 (0.40); copper never reaches 0.3 (<0.05, 0.10): left out.
      { poolId: 7, start: at(0), gapsMs: [604_800_451, 604_799_549], iron: [50, 400, null] },
      // Pool 9: manganese 0.06 >= 0.05 is kept as 60 thousandths.
      { poolId: 9, start: at(3), gapsMs: [], manganese: [60] },
    ]);
  });

  it("keeps a metal whose only high value is a detection limit out, and a value exactly at the floor in", () => {
    const edge: MetalTest[] = [
      { id: "x", poolId: "1", takenAt: 0, copper: { value: 0.5, belowDetection: true }, iron: { value: 0.2, belowDetection: false } },
    ];
    expect(encodeReadingColumns(edge, METALS, floor)).toEqual([{ poolId: 1, start: 0, gapsMs: [], iron: [200] }]);
  });

  it("decodes into the analysis input, every reading's time kept", () => {
    const decoded = decodeReadingColumns(encodeReadingColumns(tests, METALS, floor), METALS);
    expect(decoded.map((t) => [t.id, t.poolId, t.takenAt])).toEqual([
      ["7:0", "7", at(0)],
      ["7:1", "7", at(7) + 451],
      ["7:2", "7", at(14)],
      ["9:0", "9", at(3)],
    ]);
    expect(decoded[0]).toMatchObject({ iron: { value: 0.05, belowDetection: false }, copper: null, manganese: null });
    expect(decoded[2]!.iron).toBeNull();
  });

  // Stored values: 0 to 3 mg/L in thousandths (decimal(6,3)); a detection limit is above 0. Round
  // tenths come often (as in real results) so that values land exactly on a floor or a level.
  const thousandths = (min: number) => fc.oneof(fc.integer({ min, max: 3000 }), fc.integer({ min: 1, max: 30 }).map((n) => n * 100));
  const cell = fc.oneof(
    fc.constant(null),
    thousandths(0).map((n) => ({ value: n / 1000, belowDetection: false })),
    thousandths(1).map((n) => ({ value: n / 1000, belowDetection: true })),
  );
  const row = fc.record({ gap: fc.integer({ min: 1, max: 400 * DAY_MS }), copper: cell, iron: cell, manganese: cell });
  const series = fc.array(fc.array(row, { minLength: 1, maxLength: 25 }), { minLength: 1, maxLength: 5 }).map((pools) =>
    pools.flatMap((rows, p) => {
      let takenAt = Date.parse("2021-01-01T00:00:00Z") + p * 1013;
      return rows.map((r, i): MetalTest => {
        takenAt += r.gap;
        return { id: `db-${p}-${i}`, poolId: String(100 + p), takenAt, copper: r.copper, iron: r.iron, manganese: r.manganese };
      });
    }),
  );
  const floorLevel = fc.oneof(fc.integer({ min: 1, max: 2000 }), fc.integer({ min: 1, max: 20 }).map((n) => n * 100)).map((n) => n / 1000);
  const floors = fc.record({ copper: floorLevel, iron: floorLevel, manganese: floorLevel });
  // Any level the page accepts once the readings for `floor` are in: elevated at or above the
  // floor (exactly the floor half the time, else any typed number), clear from 0.001 up to the elevated level.
  const levelsAbove = (f: Record<Metal, number>) =>
    fc
      .tuple(
        ...METALS.map((m) =>
          fc.tuple(fc.oneof(fc.constant(f[m]), fc.double({ min: f[m], max: 3.5, noNaN: true })), fc.double({ min: 0, max: 1, noNaN: true })),
        ),
      )
      .map((pairs) =>
        Object.fromEntries(
          METALS.map((m, i) => {
            const [elevated, share] = pairs[i]!;
            return [m, { elevated, clear: Math.max(0.001, elevated * share) }];
          }),
        ) as MetalThresholds,
      );
  const withoutTestIds = (history: MetalHistory) => ({
    ...history,
    episodes: history.episodes.map(({ openedByTestId: _o, closedByTestId: _c, ...rest }) => rest),
  });

  it("gives the same episodes, recurrence and findings as the raw rows at every level the page allows", () => {
    fc.assert(
      fc.property(
        series,
        floors.chain((f) => fc.tuple(fc.constant(f), levelsAbove(f))),
        fc.integer({ min: 1, max: 400 }),
        fc.integer({ min: 1, max: 200 }),
        fc.subarray([...METALS], { minLength: 1 }),
        (raw, [f, thresholds], recurrenceWindowDays, chronicAfterDays, metals) => {
          const decoded = decodeReadingColumns(encodeReadingColumns(raw, metals, f), metals);
          const options = { thresholds, metals, recurrenceWindowDays, chronicAfterDays };
          expect(withoutTestIds(analyseMetalHistory(decoded, options))).toEqual(withoutTestIds(analyseMetalHistory(raw, options)));
          const labels = new Map();
          expect(findRecurring(decoded, labels, options)).toEqual(findRecurring(raw, labels, options));
        },
      ),
      { numRuns: 400 },
    );
  });

  it("sends treatments as minutes from the previous one and an index into the product list", () => {
    const t0 = Date.parse("2025-03-01T10:00:59.999Z");
    const rows = [
      { poolId: "7", appliedAt: t0, productName: "Iron sequestrant", category: "sequestrant" },
      // 1 d 2 min 1 ms later is 03-02 10:03:00.000; each time is floored to its minute
      // (10:00:59.999 -> 10:00), so the gap is 1,440 + 3 = 1,443 minutes.
      { poolId: "7", appliedAt: t0 + DAY_MS + 2 * 60_000 + 1, productName: "Collector pad", category: "pad" },
      { poolId: "9", appliedAt: t0, productName: "Iron sequestrant", category: "sequestrant" },
    ];
    const encoded = encodeTreatmentColumns(rows);
    const minute = Math.floor(t0 / 60_000);
    expect(encoded).toEqual({
      products: [
        { productName: "Iron sequestrant", category: "sequestrant" },
        { productName: "Collector pad", category: "pad" },
      ],
      pools: [
        { poolId: 7, startMinute: minute, gapsMinutes: [1443], product: [0, 1] },
        { poolId: 9, startMinute: minute, gapsMinutes: [], product: [0] },
      ],
    });
    expect(decodeTreatmentColumns(encoded.products, encoded.pools)).toEqual([
      { poolId: 7, appliedAt: "2025-03-01T10:00:00.000Z", productName: "Iron sequestrant", category: "sequestrant" },
      { poolId: 7, appliedAt: "2025-03-02T10:03:00.000Z", productName: "Collector pad", category: "pad" },
      { poolId: 9, appliedAt: "2025-03-01T10:00:00.000Z", productName: "Iron sequestrant", category: "sequestrant" },
    ]);
  });
});
