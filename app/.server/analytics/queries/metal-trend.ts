import { sql } from "drizzle-orm";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import type { Scope } from "../../scope";
import { keptMonthlyVersionFor, keptMonthValueCounts, keptPoolsElevatedByMonth, type AnswerSource } from "../kept/read-kept";
import { anyMetalMeasured } from "./metal-readings";
import { testsInScope, type TimeWindow } from "./tenant-and-window";
import { percentileOfCounts } from "@analysis/stats/percentile-of-counts";

export type MonthlyMetalFigure = {
  metal: Metal;
  /** "YYYY-MM" in the company's time zone (its UTC offset at the window's end). */
  month: string;
  readings: number;
  median: number;
  p25: number;
  p75: number;
  max: number;
  /** Readings at or above the company's elevated level (not below detection). */
  elevated: number;
  /** elevated / readings. */
  elevatedShare: number;
  /** Pools with at least one such reading in the month. */
  poolsElevated: number;
};

export type MetalTrend = { source: AnswerSource; months: MonthlyMetalFigure[]; belowDetectionRule: string };

/** Minutes the zone is ahead of UTC at one instant (negative west of Greenwich). */
function utcOffsetMinutes(timeZone: string, at: Date): number {
  const parts = new Intl.DateTimeFormat("en-US", {
    timeZone,
    hourCycle: "h23",
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
  }).formatToParts(at);
  const get = (type: string) => Number(parts.find((p) => p.type === type)?.value);
  const local = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"));
  return Math.round((local - Math.floor(at.getTime() / 60_000) * 60_000) / 60_000);
}

type MonthValueCount = { metal: Metal; month: string; value: number; belowDetection: boolean; n: number };
type MonthlyCounts = { values: MonthValueCount[]; poolsElevated: Map<string, number> };

/**
 * Per metal and month, the count of each reading and the pools with one at
 * or above the elevated level, from the tests: grouped in MariaDB by month and
 * reading (a few thousand rows however large the book). A PERCENTILE_CONT
 * window took seconds on 500k readings. Months are those of the zone's UTC
 * offset at the window's end.
 */
async function countsFromTests(scope: Scope, window: TimeWindow, metals: readonly Metal[], thresholds: MetalThresholds): Promise<MonthlyCounts> {
  const offset = utcOffsetMinutes(scope.timeZone, window.to ?? new Date());
  const monthOf = sql`DATE_FORMAT(water_tests.sampled_at + INTERVAL ${offset} MINUTE, '%Y-%m')`;
  const elevatedReading = (m: Metal) =>
    sql`${sql.raw(`water_tests.${m}`)} >= ${thresholds[m].elevated} AND ${sql.raw(`water_tests.${m}_below_detection`)} = 0`;
  const poolsQuery = db().execute(sql`
    SELECT ${monthOf} AS month,
      ${sql.join(
        metals.map((m) => sql`COUNT(DISTINCT CASE WHEN ${elevatedReading(m)} THEN water_tests.pool_id END) AS ${sql.raw(`${m}_pools`)}`),
        sql`, `,
      )}
    FROM water_tests JOIN pools ON pools.id = water_tests.pool_id
    WHERE ${testsInScope({ scope }, window)} AND (${anyMetalMeasured(metals)})
    GROUP BY 1
  `);
  const rowsQuery = db().execute(sql`
    SELECT ${monthOf} AS month,
      water_tests.copper, water_tests.copper_below_detection AS copper_bd, water_tests.iron, water_tests.iron_below_detection AS iron_bd,
      water_tests.manganese, water_tests.manganese_below_detection AS manganese_bd, COUNT(*) AS n
    FROM water_tests JOIN pools ON pools.id = water_tests.pool_id
    WHERE ${testsInScope({ scope }, window)} AND (${anyMetalMeasured(metals)})
    GROUP BY 1, 2, 3, 4, 5, 6, 7
  `);
  // Both reads are awaited together: a failure of one (a lost connection) must not leave the other's unheard.
  const [[rows], [poolRows]] = (await Promise.all([rowsQuery, poolsQuery])) as unknown as [
    [Array<Record<string, unknown>>],
    [Array<Record<string, unknown>>],
  ];
  const values: MonthValueCount[] = [];
  for (const row of rows) {
    for (const metal of metals) {
      if (row[metal] === null || row[metal] === undefined) continue;
      values.push({ metal, month: String(row.month), value: Number(row[metal]), belowDetection: Number(row[`${metal}_bd`]) === 1, n: Number(row.n) });
    }
  }
  const poolsElevated = new Map<string, number>(
    poolRows.flatMap((row) => metals.map((m) => [`${m}/${String(row.month)}`, Number(row[`${m}_pools`])] as const)),
  );
  return { values, poolsElevated };
}

/** The same counts from the kept month rows (local months of the company's zone, at each test's instant). */
async function countsFromKept(versionId: number, metals: readonly Metal[]): Promise<MonthlyCounts> {
  const [values, pools] = await Promise.all([keptMonthValueCounts(versionId, metals), keptPoolsElevatedByMonth(versionId, metals)]);
  return { values, poolsElevated: new Map(pools.map((p) => [`${p.metal}/${p.month}`, p.pools])) };
}

/**
 * For each metal and month: how many readings, how many of them at or above
 * the elevated level (and on how many pools), and the median and
 * interquartile spread across the route book, exact from per-value counts.
 * A "<x" reading counts as x/2, a common substitution for values below a
 * detection limit (US EPA, Guidance for Data Quality Assessment QA/G-9, 4.7).
 */
export async function metalTrend(scope: Scope, window: TimeWindow, metal: Metal | null, thresholds: MetalThresholds): Promise<MetalTrend> {
  const metals = metal ? [metal] : METALS;
  const versionId = await keptMonthlyVersionFor(scope, { window, thresholds });
  const counted = versionId === null ? await countsFromTests(scope, window, metals, thresholds) : await countsFromKept(versionId, metals);
  const buckets = new Map<string, Map<number, number>>();
  const elevatedCounts = new Map<string, number>();
  for (const { metal: m, month, value, belowDetection, n } of counted.values) {
    const key = `${m}/${month}`;
    if (!belowDetection && value >= thresholds[m].elevated) elevatedCounts.set(key, (elevatedCounts.get(key) ?? 0) + n);
    const counts = buckets.get(key) ?? new Map<number, number>();
    const read = belowDetection ? value / 2 : value;
    counts.set(read, (counts.get(read) ?? 0) + n);
    buckets.set(key, counts);
  }
  const months: MonthlyMetalFigure[] = [...buckets.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([key, counts]) => {
      const [m, month] = key.split("/") as [Metal, string];
      const sorted = [...counts.entries()].sort((a, b) => a[0] - b[0]).map(([value, n]) => ({ value, n }));
      const readings = sorted.reduce((sum, b) => sum + b.n, 0);
      const elevated = elevatedCounts.get(key) ?? 0;
      return {
        metal: m,
        month,
        readings,
        median: percentileOfCounts(sorted, readings, 0.5),
        p25: percentileOfCounts(sorted, readings, 0.25),
        p75: percentileOfCounts(sorted, readings, 0.75),
        max: sorted[sorted.length - 1]!.value,
        elevated,
        elevatedShare: elevated / readings,
        poolsElevated: counted.poolsElevated.get(key) ?? 0,
      };
    });
  return {
    source: versionId === null ? "recomputed" : "kept",
    months,
    belowDetectionRule: "A reading below the detection limit counts as half the limit.",
  };
}
