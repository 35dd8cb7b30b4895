import { and, eq, or, sql, type SQL } from "drizzle-orm";
import { DEFAULT_EPISODE_RULES } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { pools, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import {
  encodeReadingColumns,
  encodeTreatmentColumns,
  type ReadingColumns,
  type TreatmentColumns,
  type TreatmentProduct,
} from "~/lib/analytics/reading-columns";
import { findRecurring, recurringFromHistory, type RecurringFindings } from "@analysis/metals/recurring-finder";
import { keptMetalHistory, keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { metalReadings, treatmentRows } from "./metal-readings";
import { poolProfiles } from "./pool-profiles";
import { testsInScope, type AnalyticsParams, type TimeWindow } from "./tenant-and-window";

export type RecurringParams = AnalyticsParams & { recurrenceWindowDays?: number; chronicAfterDays?: number };

/**
 * Pools with at least one reading at or above `floor` for one of the metals:
 * the only pools that can have an episode when the elevated level is not
 * below the floor. Grouped in MariaDB, so readings are then read only for them.
 */
async function poolsReaching(scope: Scope, window: TimeWindow, metals: readonly Metal[], floor: (metal: Metal) => number): Promise<number[]> {
  const reaches: SQL[] = metals.map(
    (metal) => sql`(${waterTests[metal]} >= ${floor(metal)} AND ${waterTests[`${metal}BelowDetection`]} = 0)`,
  );
  const rows = await db()
    .selectDistinct({ poolId: waterTests.poolId })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(
      and(
        testsInScope({ scope }, window),
        or(...reaches),
      ),
    );
  return rows.map((r) => r.poolId).sort((a, b) => a - b);
}

function rulesOf(params: RecurringParams) {
  return {
    recurrenceWindowDays: params.recurrenceWindowDays ?? DEFAULT_EPISODE_RULES.recurrenceWindowDays,
    chronicAfterDays: params.chronicAfterDays ?? DEFAULT_EPISODE_RULES.chronicAfterDays,
  };
}

export async function recurringPools(scope: Scope, params: RecurringParams): Promise<RecurringFindings & { source: AnswerSource }> {
  const metals = params.metal ? [params.metal] : METALS;
  const rules = rulesOf(params);
  const companyRules = rules.recurrenceWindowDays === DEFAULT_EPISODE_RULES.recurrenceWindowDays && rules.chronicAfterDays === DEFAULT_EPISODE_RULES.chronicAfterDays;
  const versionId = companyRules ? await keptVersionFor(scope.companyId, params) : null;
  if (versionId !== null) {
    const history = await keptMetalHistory({ scope }, versionId, params.metal ?? "all");
    const withEpisodes = [...new Set(history.episodes.map((e) => Number(e.poolId)))];
    const book = await poolProfiles({ scope }, { poolIds: withEpisodes });
    return { ...recurringFromHistory(history, book.labels, { metals, ...rules }), source: "kept" };
  }
  const candidates = await poolsReaching(scope, params.window, metals, (metal) => params.thresholds[metal].elevated);
  const [readings, book] = await Promise.all([
    metalReadings({ scope }, { window: params.window, metals, poolIds: candidates }),
    poolProfiles({ scope }, { poolIds: candidates }),
  ]);
  return { ...findRecurring(readings, book.labels, { thresholds: params.thresholds, metals, ...rules }), source: "recomputed" };
}

export type RecurringReadings = {
  thresholds: MetalThresholds;
  /** The elevated levels the readings were chosen for: any pool with an episode at these levels or stricter ones is here. */
  lowestElevated: Record<Metal, number>;
  /**
   * Null for the full answer. Otherwise only the first pools listed at `thresholds` are here (enough to draw
   * their charts, not to move the levels or list more), with the counts of the whole list.
   */
  firstListed: { recurringPools: number; chronicPools: number; listedPools: number } | null;
  rules: { recurrenceWindowDays: number; chronicAfterDays: number };
  metals: Metal[];
  pools: Array<{ poolId: number; street: string; customerName: string; routeName: string | null; fillSourceName: string | null }>;
  /** Each pool's readings as columns, a metal left out where it never reaches `lowestElevated` (see ReadingColumns). */
  readings: ReadingColumns[];
  /** Products given, referred to by index from `treatments`. */
  products: TreatmentProduct[];
  treatments: TreatmentColumns[];
};

/**
 * Readings and treatments of every pool with a reading at or above the
 * request's elevated level of a metal: the only pools that can have an episode
 * at those levels or stricter ones, whatever the clear level. The browser
 * reruns the episode analysis on them as the levels move, and asks again only
 * when an elevated level goes below these.
 *
 * With `firstListed`, only the first that many pools listed (recurring or
 * chronic) at the request's own levels are kept: episodes are found pool by
 * pool, so their findings are unchanged. That is what a first paint at the
 * company's levels draws.
 */
export async function recurringReadings(scope: Scope, params: RecurringParams, options: { firstListed?: number } = {}): Promise<RecurringReadings> {
  const metals = params.metal ? [params.metal] : [...METALS];
  const rules = rulesOf(params);
  const lowestElevated = Object.fromEntries(METALS.map((m) => [m, params.thresholds[m].elevated])) as Record<Metal, number>;
  const candidates = await poolsReaching(scope, params.window, metals, (metal) => lowestElevated[metal]);
  let readings = await metalReadings({ scope }, { window: params.window, metals, poolIds: candidates });
  let poolIds = candidates;
  let firstListed: RecurringReadings["firstListed"] = null;
  if (options.firstListed !== undefined) {
    const findings = findRecurring(readings, new Map(), { thresholds: params.thresholds, metals, ...rules });
    firstListed = { recurringPools: findings.recurringPools, chronicPools: findings.chronicPools, listedPools: findings.pools.length };
    poolIds = findings.pools.slice(0, options.firstListed).map((p) => p.poolId);
    const keep = new Set(poolIds.map(String));
    readings = readings.filter((r) => keep.has(r.poolId));
    poolIds.sort((a, b) => a - b);
  }
  const [book, treated] = await Promise.all([
    poolProfiles({ scope }, { poolIds }),
    treatmentRows({ scope }, { window: params.window, poolIds }),
  ]);
  const treatedColumns = encodeTreatmentColumns(treated);
  return {
    thresholds: params.thresholds,
    lowestElevated,
    firstListed,
    rules,
    metals,
    pools: [...book.labels.values()].map((l) => ({
      poolId: l.poolId,
      street: l.street,
      customerName: l.customerName,
      routeName: l.routeName,
      fillSourceName: l.fillSourceName,
    })),
    readings: encodeReadingColumns(readings, metals, lowestElevated),
    products: treatedColumns.products,
    treatments: treatedColumns.pools,
  };
}
