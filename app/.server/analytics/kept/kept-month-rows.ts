import { METALS, type Metal } from "@analysis/metals/reading";
import type { KeptMetalMonth, KeptPoolMonth } from "@analysis/metals/kept-months";
import type { SqlValue } from "mysql2";

/** A pool-month's reading counts as stored: per metal measured, [value, n], or [value, n, 1] for below detection. */
type StoredReadingCounts = Partial<Record<Metal, Array<[number, number] | [number, number, 1]>>>;

/** The columns of a kept pool-month after the version, in the order `keptMonthRow` lists its values. */
export const KEPT_MONTH_COLUMNS =
  "pool_id, month, company_id, days, copper_readings, copper_elevated, iron_readings, iron_elevated, manganese_readings, manganese_elevated, elevated_metals, reading_counts";

/** The bit of each metal in `elevated_metals`: copper 1, iron 2, manganese 4. */
export const elevatedBit = (metal: Metal) => 1 << METALS.indexOf(metal);

/** A pool-month as the values of one row (version first), in KEPT_MONTH_COLUMNS order. */
export function keptMonthRow(versionId: number, companyId: number, m: KeptPoolMonth): SqlValue[] {
  const counts: StoredReadingCounts = {};
  let elevatedMetals = 0;
  const perMetal: number[] = [];
  for (const metal of METALS) {
    const month = m.metals[metal];
    perMetal.push(month?.readings ?? 0, month?.elevated ?? 0);
    if (!month) continue;
    if (month.elevated > 0) elevatedMetals |= elevatedBit(metal);
    counts[metal] = month.values.map((v) => (v.belowDetection ? [v.value, v.n, 1] : [v.value, v.n]));
  }
  return [versionId, Number(m.poolId), m.month, companyId, m.days, ...perMetal, elevatedMetals, JSON.stringify(counts)];
}

/** A kept pool-month read back from its row (the columns of KEPT_MONTH_COLUMNS, by name). */
export function keptMonthOf(row: Record<string, unknown>): KeptPoolMonth {
  const stored = JSON.parse(String(row.reading_counts)) as StoredReadingCounts;
  const metals: Partial<Record<Metal, KeptMetalMonth>> = {};
  for (const metal of METALS) {
    const values = stored[metal];
    if (!values) continue;
    metals[metal] = {
      readings: Number(row[`${metal}_readings`]),
      elevated: Number(row[`${metal}_elevated`]),
      values: values.map(([value, n, below]) => ({ value, belowDetection: below === 1, n })),
    };
  }
  return { poolId: String(row.pool_id), month: String(row.month), days: Number(row.days), metals };
}
