import { count, eq, max, min } from "drizzle-orm";
import { analyseMetalHistory, type MetalHistory } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { pools, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { stopIfAbandoned } from "../../request-context";
import { keptMetalHistory, keptSpans, keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { metalReadings } from "./metal-readings";
import { poolProfiles, type RouteBookProfiles } from "./pool-profiles";
import { testsInScope, type AnalyticsParams, type TimeWindow } from "./tenant-and-window";

export type ObservedSpan = { poolId: string; firstAt: number; lastAt: number; tests: number; latestBalanceAt?: number | null };

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
    .groupBy(waterTests.poolId)
    .orderBy(waterTests.poolId);
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
  book: RouteBookProfiles;
  spans: ObservedSpan[];
  history: MetalHistory;
  source: AnswerSource;
  /** The kept version read, for an answer from the kept results. */
  versionId?: number;
};

/** `chosen`: the kept version (or null: none) the caller already chose for this request, so its other reads use the same one. */
export async function loadMetalDataset(scope: Scope, params: AnalyticsParams, chosen?: number | null): Promise<MetalDataset> {
  const metals = params.metal ? [params.metal] : METALS;
  const versionId = chosen !== undefined ? chosen : await keptVersionFor(scope.companyId, params);
  if (versionId !== null) {
    const tenant = { scope };
    const [history, book, spans] = await Promise.all([
      keptMetalHistory(tenant, versionId, params.metal ?? "all"),
      poolProfiles(tenant),
      keptSpans(tenant, versionId, "any"),
    ]);
    return {
      metals,
      thresholds: params.thresholds,
      book,
      spans: spans.map((s) => ({ poolId: s.poolId, firstAt: s.firstTestAt, lastAt: s.lastTestAt, tests: s.tests, latestBalanceAt: s.latestBalanceAt })),
      history,
      source: "kept",
      versionId,
    };
  }
  const [readings, book, spans] = await Promise.all([
    metalReadings({ scope }, { window: params.window, metals }),
    poolProfiles({ scope }),
    observedSpans(scope, params.window),
  ]);
  stopIfAbandoned();
  const history = analyseMetalHistory(readings, { thresholds: params.thresholds, metals });
  return { metals, thresholds: params.thresholds, book, spans, history, source: "recomputed" };
}
