import { and, eq, or, sql, type SQL } from "drizzle-orm";
import { DEFAULT_EPISODE_RULES } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { pools, waterTests } from "../../db/schema";
import type { Scope } from "../../guard";
import { poolsInScope } from "../scope";
import { compactReading, findRecurring, type CompactReading, type RecurringFindings } from "~/lib/analytics/recurring";
import { metalReadings, treatmentRows } from "../metal-readings";
import { poolProfiles } from "./rows";
import type { AnalyticsParams, AnalyticsWindow } from "./window";

export type RecurringParams = AnalyticsParams & { recurrenceWindowDays?: number; chronicAfterDays?: number };

/**
 * Pools with at least one reading at or above `floor` for one of the metals:
 * the only pools that can have an episode when the elevated level is not
 * below the floor. Grouped in MariaDB, so readings are then read only for them.
 */
async function poolsReaching(scope: Scope, window: AnalyticsWindow, metals: readonly Metal[], floor: (metal: Metal) => number): Promise<number[]> {
  const reaches: SQL[] = metals.map(
    (metal) => sql`(${waterTests[metal]} >= ${floor(metal)} AND ${waterTests[`${metal}BelowDetection`]} = 0)`,
  );
  const rows = await db()
    .selectDistinct({ poolId: waterTests.poolId })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(
      and(
        poolsInScope(scope),
        eq(waterTests.companyId, scope.companyId),
        or(...reaches),
        window.from ? sql`${waterTests.sampledAt} >= ${window.from}` : undefined,
        window.to ? sql`${waterTests.sampledAt} <= ${window.to}` : undefined,
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

export async function recurringPools(scope: Scope, params: RecurringParams): Promise<RecurringFindings> {
  const metals = params.metal ? [params.metal] : METALS;
  const candidates = await poolsReaching(scope, params.window, metals, (metal) => params.thresholds[metal].elevated);
  const [readings, book] = await Promise.all([
    metalReadings({ scope }, { window: params.window, metals, poolIds: candidates }),
    poolProfiles(scope, { poolIds: candidates }),
  ]);
  return findRecurring(readings, book.labels, { thresholds: params.thresholds, metals, ...rulesOf(params) });
}

export type RecurringReadings = {
  thresholds: MetalThresholds;
  /** The elevated levels the readings were chosen for: any pool with an episode at these levels or stricter ones is here. */
  lowestElevated: Record<Metal, number>;
  rules: { recurrenceWindowDays: number; chronicAfterDays: number };
  metals: Metal[];
  pools: Array<{ poolId: number; street: string; customerName: string; routeName: string | null; fillSourceName: string | null }>;
  /** [poolId, epoch ms, copper, copper "<", iron, iron "<", manganese, manganese "<"], ordered by pool and time. */
  readings: CompactReading[];
  treatments: Array<{ poolId: number; appliedAt: string; productName: string; category: string }>;
};

/**
 * Readings and treatments of every pool with a reading at or above the
 * request's elevated level of a metal: the only pools that can have an episode
 * at those levels or stricter ones, whatever the clear level. The browser
 * reruns the episode analysis on them as the levels move, and asks again only
 * when an elevated level goes below these.
 */
export async function recurringReadings(scope: Scope, params: RecurringParams): Promise<RecurringReadings> {
  const metals = params.metal ? [params.metal] : [...METALS];
  const lowestElevated = Object.fromEntries(METALS.map((m) => [m, params.thresholds[m].elevated])) as Record<Metal, number>;
  const candidates = await poolsReaching(scope, params.window, metals, (metal) => lowestElevated[metal]);
  const [readings, book, treated] = await Promise.all([
    metalReadings({ scope }, { window: params.window, metals, poolIds: candidates }),
    poolProfiles(scope, { poolIds: candidates }),
    treatmentRows({ scope }, { window: params.window, poolIds: candidates }),
  ]);
  return {
    thresholds: params.thresholds,
    lowestElevated,
    rules: rulesOf(params),
    metals,
    pools: [...book.labels.values()].map((l) => ({
      poolId: l.poolId,
      street: l.street,
      customerName: l.customerName,
      routeName: l.routeName,
      fillSourceName: l.fillSourceName,
    })),
    readings: readings.map(compactReading),
    treatments: treated.map((t) => ({
      poolId: Number(t.poolId),
      appliedAt: new Date(t.appliedAt).toISOString(),
      productName: t.productName,
      category: t.category,
    })),
  };
}
