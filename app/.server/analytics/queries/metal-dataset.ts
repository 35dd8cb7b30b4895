import { count, eq, max, min } from "drizzle-orm";
import { analyseMetalHistory, type MetalHistory, type MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { pools, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { stopIfAbandoned } from "../../request-context";
import { metalReadings } from "./metal-readings";
import { poolProfiles, type RouteBookProfiles } from "./pool-profiles";
import { testsInScope, type AnalyticsParams, type TimeWindow } from "./tenant-and-window";

export type ObservedSpan = { poolId: string; firstAt: number; lastAt: number; tests: number };

/**
 * Each pool's first and last test in the window (any analyte): the time it
 * was observed. Grouped in MariaDB, one row per pool.
 */
async function observedSpans(scope: Scope, window: TimeWindow): Promise<ObservedSpan[]> {
  const rows = await db()
    .select({
      poolId: waterTests.poolId,
      firstAt: min(waterTests.sampledAt),
      lastAt: max(waterTests.sampledAt),
      tests: count(),
    })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(testsInScope({ scope }, window))
    .groupBy(waterTests.poolId);
  return rows
    .filter((r) => r.firstAt !== null && r.lastAt !== null)
    .map((r) => ({ poolId: String(r.poolId), firstAt: r.firstAt!.getTime(), lastAt: r.lastAt!.getTime(), tests: r.tests }));
}

/**
 * The rows most route-book questions share, read once per request: metal
 * readings (narrow, ordered by pool and time), pool profiles, each pool's
 * observed span, and the metal history the analysis core makes of them.
 */
export type MetalDataset = {
  metals: readonly Metal[];
  thresholds: MetalThresholds;
  readings: MetalTest[];
  book: RouteBookProfiles;
  spans: ObservedSpan[];
  history: MetalHistory;
};

export async function loadMetalDataset(scope: Scope, params: AnalyticsParams): Promise<MetalDataset> {
  const metals = params.metal ? [params.metal] : METALS;
  const [readings, book, spans] = await Promise.all([
    metalReadings({ scope }, { window: params.window, metals }),
    poolProfiles({ scope }),
    observedSpans(scope, params.window),
  ]);
  stopIfAbandoned();
  const history = analyseMetalHistory(readings, { thresholds: params.thresholds, metals });
  return { metals, thresholds: params.thresholds, readings, book, spans, history };
}
