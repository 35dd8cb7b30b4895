import type { MetalTest } from "@analysis/metals/episodes";
import type { Metal, MetalReading } from "@analysis/metals/reading";

/**
 * One pool's metal readings as columns, for the wire.
 *
 * - `start` is the first reading's time (epoch ms); `gapsMs[i]` is the time from
 *   reading i to reading i + 1 in ms. The store keeps milliseconds and the
 *   episode rules compare durations to the millisecond (chronic is "more than
 *   60 days", recurrence "within 365 days"), so coarser steps could move an
 *   episode's end or flip a verdict at the boundary.
 * - One array per metal, one entry per reading: thousandths of mg/L (the
 *   stored precision), negative for a "<x" detection limit (a limit of 0 is
 *   refused at entry, so the sign is never lost), null when not measured.
 * - A metal is left out when the pool never reaches `floor` for it: it cannot
 *   open an episode at any elevated level at or above the floor. Every
 *   reading's time stays, because an episode still open at the end of the data
 *   ends at the pool's last test and counts every test while open.
 */
export type ReadingColumns = {
  poolId: number;
  start: number;
  gapsMs: number[];
} & Partial<Record<Metal, Array<number | null>>>;

const toThousandths = (reading: MetalReading) => {
  const thousandths = Math.round(reading.value * 1000);
  return reading.belowDetection ? -thousandths : thousandths;
};

const fromThousandths = (cell: number): MetalReading => ({ value: Math.abs(cell) / 1000, belowDetection: cell < 0 });

/** Groups readings by pool (keeping their order) and turns each pool into columns. */
export function encodeReadingColumns(tests: readonly MetalTest[], metals: readonly Metal[], floor: Readonly<Record<Metal, number>>): ReadingColumns[] {
  const byPool = new Map<string, MetalTest[]>();
  for (const test of tests) {
    const list = byPool.get(test.poolId);
    if (list) list.push(test);
    else byPool.set(test.poolId, [test]);
  }
  return [...byPool.values()].map((rows) => {
    const first = rows[0]!;
    const columns: ReadingColumns = {
      poolId: Number(first.poolId),
      start: first.takenAt,
      gapsMs: rows.slice(1).map((row, i) => row.takenAt - rows[i]!.takenAt),
    };
    for (const metal of metals) {
      const reaches = rows.some((row) => {
        const reading = row[metal];
        return reading != null && !reading.belowDetection && reading.value >= floor[metal];
      });
      if (reaches) columns[metal] = rows.map((row) => (row[metal] ? toThousandths(row[metal]) : null));
    }
    return columns;
  });
}

/** The analysis input back from the columns; test ids are "poolId:index", unique within the answer. */
export function decodeReadingColumns(series: readonly ReadingColumns[], metals: readonly Metal[]): MetalTest[] {
  const tests: MetalTest[] = [];
  for (const pool of series) {
    const poolId = String(pool.poolId);
    let takenAt = pool.start;
    for (let i = 0; i <= pool.gapsMs.length; i++) {
      if (i > 0) takenAt += pool.gapsMs[i - 1]!;
      const test: MetalTest = { id: `${poolId}:${i}`, poolId, takenAt };
      for (const metal of metals) {
        const cell = pool[metal]?.[i];
        test[metal] = cell == null ? null : fromThousandths(cell);
      }
      tests.push(test);
    }
  }
  return tests;
}

export type TreatmentMark = { poolId: number; appliedAt: string; productName: string; category: string };

/**
 * One pool's treatments as columns: times in whole minutes (they only place
 * a mark and a date on the chart), and each product as its index in the
 * answer's product list, since a company uses a few products many times.
 */
export type TreatmentColumns = { poolId: number; startMinute: number; gapsMinutes: number[]; product: number[] };
export type TreatmentProduct = { productName: string; category: string };

const MINUTE_MS = 60_000;

export function encodeTreatmentColumns(
  rows: ReadonlyArray<{ poolId: string | number; appliedAt: number; productName: string; category: string }>,
): { products: TreatmentProduct[]; pools: TreatmentColumns[] } {
  const products: TreatmentProduct[] = [];
  const productIndex = new Map<string, number>();
  const byPool = new Map<number, TreatmentColumns & { lastMinute: number }>();
  for (const row of rows) {
    const key = JSON.stringify([row.productName, row.category]);
    let index = productIndex.get(key);
    if (index === undefined) {
      index = products.push({ productName: row.productName, category: row.category }) - 1;
      productIndex.set(key, index);
    }
    const minute = Math.floor(row.appliedAt / MINUTE_MS);
    const poolId = Number(row.poolId);
    const pool = byPool.get(poolId);
    if (pool) {
      pool.gapsMinutes.push(minute - pool.lastMinute);
      pool.product.push(index);
      pool.lastMinute = minute;
    } else {
      byPool.set(poolId, { poolId, startMinute: minute, gapsMinutes: [], product: [index], lastMinute: minute });
    }
  }
  return { products, pools: [...byPool.values()].map(({ lastMinute: _last, ...pool }) => pool) };
}

export function decodeTreatmentColumns(products: readonly TreatmentProduct[], pools: readonly TreatmentColumns[]): TreatmentMark[] {
  return pools.flatMap((pool) => {
    let minute = pool.startMinute;
    return pool.product.map((index, i) => {
      if (i > 0) minute += pool.gapsMinutes[i - 1]!;
      const product = products[index]!;
      return { poolId: pool.poolId, appliedAt: new Date(minute * MINUTE_MS).toISOString(), productName: product.productName, category: product.category };
    });
  });
}
