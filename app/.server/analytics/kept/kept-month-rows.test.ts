import { describe, expect, it } from "vitest";
import type { KeptPoolMonth } from "@analysis/metals/kept-months";
import { KEPT_MONTH_COLUMNS, elevatedBit, keptMonthOf, keptMonthRow } from "./kept-month-rows";

const month: KeptPoolMonth = {
  poolId: "12",
  month: "2025-07",
  days: 3,
  metals: {
    copper: {
      readings: 4,
      elevated: 2,
      values: [
        { value: 0.1, belowDetection: false, n: 2 },
        { value: 0.5, belowDetection: false, n: 2 },
      ],
    },
    manganese: { readings: 1, elevated: 0, values: [{ value: 0.05, belowDetection: true, n: 1 }] },
  },
};

/** The row as the driver hands it back: by column name, the reading counts as text. */
function asRead(values: readonly unknown[]): Record<string, unknown> {
  const columns = ["version_id", ...KEPT_MONTH_COLUMNS.split(", ")];
  return Object.fromEntries(columns.map((column, i) => [column, values[i]]));
}

describe("a kept pool-month as a row", () => {
  it("lists each metal's counts, the metals above the level as bits and the readings compactly", () => {
    const row = keptMonthRow(5, 2, month);
    expect(row.slice(0, 12)).toEqual([5, 12, "2025-07", 2, 3, 4, 2, 0, 0, 1, 0, elevatedBit("copper")]);
    expect(JSON.parse(String(row[12]))).toEqual({
      copper: [
        [0.1, 2],
        [0.5, 2],
      ],
      manganese: [[0.05, 1, 1]],
    });
    expect([elevatedBit("copper"), elevatedBit("iron"), elevatedBit("manganese")]).toEqual([1, 2, 4]);
  });

  it("reads back as the month it was written from", () => {
    expect(keptMonthOf(asRead(keptMonthRow(5, 2, month)))).toEqual(month);
    const bare: KeptPoolMonth = {
      poolId: "3",
      month: "2024-01",
      days: 1,
      metals: { iron: { readings: 1, elevated: 1, values: [{ value: 2, belowDetection: false, n: 1 }] } },
    };
    expect(keptMonthRow(1, 1, bare)[11]).toBe(elevatedBit("iron"));
    expect(keptMonthOf(asRead(keptMonthRow(1, 1, bare)))).toEqual(bare);
  });
});
