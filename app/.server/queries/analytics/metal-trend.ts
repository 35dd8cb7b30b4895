import { sql } from "drizzle-orm";
import { METALS, type Metal } from "@analysis/metals/reading";
import { db } from "../../db/client";
import type { Scope } from "../../guard";
import { poolsInScope } from "../scope";
import type { AnalyticsWindow } from "./window";

export type MonthlyMetalFigure = {
  metal: Metal;
  /** "YYYY-MM" in the company's time zone (its UTC offset at the window's end). */
  month: string;
  readings: number;
  pools: number;
  median: number;
  p25: number;
  p75: number;
  max: number;
};

export type MetalTrend = { months: MonthlyMetalFigure[]; belowDetectionRule: string };

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

/**
 * Median and interquartile spread of each metal per month across the route
 * book. MariaDB computes the percentiles (PERCENTILE_CONT as a window over the
 * month) and returns one row per metal and month, not the readings.
 * A "<x" reading counts as x/2, a common substitution for values below a
 * detection limit (US EPA, Guidance for Data Quality Assessment QA/G-9, 4.7).
 */
export async function metalTrend(scope: Scope, window: AnalyticsWindow, metal: Metal | null): Promise<MetalTrend> {
  const offset = utcOffsetMinutes(scope.timeZone, window.to ?? new Date());
  const metals = metal ? [metal] : METALS;
  const perMetal = metals.map(
    (m) => sql`
      SELECT ${m} AS metal, t.pool_id AS pool_id,
        DATE_FORMAT(t.sampled_at + INTERVAL ${offset} MINUTE, '%Y-%m') AS month,
        CASE WHEN ${sql.raw(`t.${m}_below_detection`)} = 1 THEN ${sql.raw(`t.${m}`)} / 2 ELSE ${sql.raw(`t.${m}`)} END AS value
      FROM water_tests t JOIN pools ON pools.id = t.pool_id
      WHERE ${poolsInScope(scope)} AND t.company_id = ${scope.companyId} AND ${sql.raw(`t.${m}`)} IS NOT NULL
        ${window.from ? sql`AND t.sampled_at >= ${window.from}` : sql``}
        ${window.to ? sql`AND t.sampled_at <= ${window.to}` : sql``}`,
  );
  const [rows] = (await db().execute(sql`
    SELECT DISTINCT metal, month,
      COUNT(*) OVER (PARTITION BY metal, month) AS readings,
      PERCENTILE_CONT(0.5) WITHIN GROUP (ORDER BY value) OVER (PARTITION BY metal, month) AS median,
      PERCENTILE_CONT(0.25) WITHIN GROUP (ORDER BY value) OVER (PARTITION BY metal, month) AS p25,
      PERCENTILE_CONT(0.75) WITHIN GROUP (ORDER BY value) OVER (PARTITION BY metal, month) AS p75,
      MAX(value) OVER (PARTITION BY metal, month) AS max_value
    FROM (${sql.join(perMetal, sql` UNION ALL `)}) readings
    ORDER BY metal, month
  `)) as unknown as [Array<Record<string, unknown>>];
  const [poolRows] = (await db().execute(sql`
    SELECT metal, month, COUNT(DISTINCT pool_id) AS pools
    FROM (${sql.join(perMetal, sql` UNION ALL `)}) readings
    GROUP BY metal, month
  `)) as unknown as [Array<Record<string, unknown>>];
  const poolCounts = new Map(poolRows.map((r) => [`${r.metal}/${r.month}`, Number(r.pools)]));
  return {
    months: rows.map((r) => ({
      metal: r.metal as Metal,
      month: String(r.month),
      readings: Number(r.readings),
      pools: poolCounts.get(`${r.metal}/${r.month}`) ?? 0,
      median: Number(r.median),
      p25: Number(r.p25),
      p75: Number(r.p75),
      max: Number(r.max_value),
    })),
    belowDetectionRule: "A reading below the detection limit counts as half the limit.",
  };
}
