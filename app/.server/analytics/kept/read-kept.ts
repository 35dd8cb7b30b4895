import { and, asc, count, eq, gt, inArray, isNull, or } from "drizzle-orm";
import { DAY_MS, type Episode, type MetalHistory, type PoolObservation } from "@analysis/metals/episodes";
import { historyFromKept, metalsReadAs, type ReadAs } from "@analysis/metals/kept-history";
import { notTested, type MetalStateOfPool } from "@analysis/metals/metal-state";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { arrayRows } from "../../db/array-rows";
import { db } from "../../db/client";
import { inIdList } from "../../db/id-list";
import { epochMs } from "../../db/values";
import { serverEnv } from "../../env";
import { keptEpisodes, keptMonthValues, keptPoolMonths, keptPoolSpans, keptVersions, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { rowsOfTenantPools, type Tenant, type TimeWindow } from "../queries/tenant-and-window";
import { elevatedBit } from "./kept-month-rows";
import { readyVersionFor } from "./versions";

/** Where an answer came from: the kept results, or the tests read and worked out for this request. */
export type AnswerSource = "kept" | "recomputed";

/**
 * The kept version that can answer a request, or null. Kept results cover
 * all of a pool's history under the company's own levels; a date window or
 * levels laid over the settings are answered from the tests.
 */
export async function keptVersionFor(companyId: number, request: { window?: TimeWindow; thresholds: MetalThresholds }): Promise<number | null> {
  if (serverEnv().PATINA_KEPT_ANALYTICS === "off") return null;
  if (request.window && (request.window.from || request.window.to)) return null;
  return readyVersionFor(companyId, request.thresholds);
}

/**
 * The kept version that answers as of `now` (mail worked out for a moment
 * already past), or null. Kept rows cover every test, so they answer only
 * while none of the pools' tests (the company's, without `poolIds`) is later than `now`.
 */
export async function keptVersionAsOf(companyId: number, thresholds: MetalThresholds, now: Date, poolIds?: readonly number[]): Promise<number | null> {
  const versionId = await keptVersionFor(companyId, { thresholds });
  if (versionId === null) return null;
  if (poolIds && poolIds.length === 0) return versionId;
  const later = await db()
    .select({ id: waterTests.id })
    .from(waterTests)
    .where(and(eq(waterTests.companyId, companyId), poolIds ? inIdList(waterTests.poolId, poolIds) : undefined, gt(waterTests.sampledAt, now)))
    .limit(1);
  return later.length === 0 ? versionId : null;
}

export type KeptPoolSpan = PoolObservation & { latestBalanceAt: number | null };

/** Each pool's observed span, read one way ("any": every test), ordered by pool. */
export async function keptSpans(tenant: Tenant, versionId: number, readAs: ReadAs | "any", poolIds?: readonly number[]): Promise<KeptPoolSpan[]> {
  if (poolIds && poolIds.length === 0) return [];
  const rows = await arrayRows<[poolId: number, firstAt: number, lastAt: number, tests: number, latestBalanceAt: number | null]>(
    db()
      .select({
        poolId: keptPoolSpans.poolId,
        firstAt: epochMs(keptPoolSpans.firstAt),
        lastAt: epochMs(keptPoolSpans.lastAt),
        tests: keptPoolSpans.tests,
        latestBalanceAt: epochMs(keptPoolSpans.latestBalanceAt),
      })
      .from(keptPoolSpans)
      .where(and(eq(keptPoolSpans.versionId, versionId), eq(keptPoolSpans.readAs, readAs), rowsOfTenantPools(tenant, keptPoolSpans, poolIds)))
      .orderBy(asc(keptPoolSpans.poolId)),
  );
  return rows.map(([poolId, firstAt, lastAt, tests, latestBalanceAt]) => ({
    poolId: String(poolId),
    firstTestAt: Number(firstAt),
    lastTestAt: Number(lastAt),
    tests,
    latestBalanceAt: latestBalanceAt === null ? null : Number(latestBalanceAt),
  }));
}

/**
 * The kept episodes of one reading: a metal's own rows, and the all-metals
 * rows of that metal that are also its episodes read alone (see KeptEpisode).
 */
function episodesOfReading(readAs: ReadAs) {
  if (readAs === "all") return eq(keptEpisodes.readAs, "all");
  return or(eq(keptEpisodes.readAs, readAs), and(eq(keptEpisodes.readAs, "all"), eq(keptEpisodes.alone, true), eq(keptEpisodes.metal, readAs)));
}

/** Kept episodes read one way, ordered by pool and in the order the analysis found them. */
export async function keptEpisodeList(tenant: Tenant, versionId: number, readAs: ReadAs, poolIds?: readonly number[]): Promise<Episode[]> {
  if (poolIds && poolIds.length === 0) return [];
  type EpisodeRow = [
    poolId: number,
    metal: Metal,
    openedAt: number,
    openedByTestId: number | string,
    closedAt: number | null,
    closedByTestId: number | string | null,
    endAt: number,
    peak: number,
    testCount: number,
    chronic: number,
    recurrence: number,
  ];
  const rows = await arrayRows<EpisodeRow>(
    db()
      .select({
        poolId: keptEpisodes.poolId,
        metal: keptEpisodes.metal,
        openedAt: epochMs(keptEpisodes.openedAt),
        openedByTestId: keptEpisodes.openedByTestId,
        closedAt: epochMs(keptEpisodes.closedAt),
        closedByTestId: keptEpisodes.closedByTestId,
        endAt: epochMs(keptEpisodes.endAt),
        peak: keptEpisodes.peak,
        testCount: keptEpisodes.testCount,
        chronic: keptEpisodes.chronic,
        recurrence: keptEpisodes.recurrence,
      })
      .from(keptEpisodes)
      .where(and(eq(keptEpisodes.versionId, versionId), episodesOfReading(readAs), rowsOfTenantPools(tenant, keptEpisodes, poolIds)))
      .orderBy(asc(keptEpisodes.poolId), asc(keptEpisodes.seq)),
  );
  return rows.map(([poolId, metal, openedAtMs, openedByTestId, closedAtMs, closedByTestId, endAtMs, peak, testCount, chronic, recurrence]) => {
    const openedAt = Number(openedAtMs);
    const endAt = Number(endAtMs);
    const closedAt = closedAtMs === null ? null : Number(closedAtMs);
    return {
      poolId: String(poolId),
      metal,
      openedAt,
      openedByTestId: String(openedByTestId),
      closedAt,
      closedByTestId: closedByTestId === null ? null : String(closedByTestId),
      censored: closedAt === null,
      endAt,
      durationDays: (endAt - openedAt) / DAY_MS,
      peak,
      testCount,
      chronic: chronic === 1,
      recurrence: recurrence === 1,
    };
  });
}

/** The metal history of the tenant's pools (or some of them) as kept, read one way. */
export async function keptMetalHistory(tenant: Tenant, versionId: number, readAs: ReadAs, poolIds?: readonly number[]): Promise<MetalHistory> {
  const [episodes, spans] = await Promise.all([keptEpisodeList(tenant, versionId, readAs, poolIds), keptSpans(tenant, versionId, readAs, poolIds)]);
  const observed = spans.map(({ poolId, firstTestAt, lastTestAt, tests }) => ({ poolId, firstTestAt, lastTestAt, tests }));
  return historyFromKept(episodes, observed, metalsReadAs(readAs));
}

/**
 * The kept version that can answer a company-wide monthly question in this
 * time zone, or null: the monthly rows are the company's (not a member's
 * routes) and use the local months of the zone they were built in.
 */
export async function keptMonthlyVersionFor(scope: Scope, request: { window?: TimeWindow; thresholds: MetalThresholds }): Promise<number | null> {
  if (scope.routeIds !== null) return null;
  const versionId = await keptVersionFor(scope.companyId, request);
  if (versionId === null) return null;
  const [version] = await db().select({ timeZone: keptVersions.timeZone }).from(keptVersions).where(eq(keptVersions.id, versionId));
  return version?.timeZone === scope.timeZone ? versionId : null;
}

/** The company's readings of the metals per local month, as counts of each value. */
export function keptMonthValueCounts(versionId: number, metals: readonly Metal[]) {
  return db()
    .select({
      metal: keptMonthValues.metal,
      month: keptMonthValues.month,
      value: keptMonthValues.value,
      belowDetection: keptMonthValues.belowDetection,
      n: keptMonthValues.n,
    })
    .from(keptMonthValues)
    .where(and(eq(keptMonthValues.versionId, versionId), gt(keptMonthValues.n, 0), inArray(keptMonthValues.metal, [...metals])));
}

/** Per metal and local month, the pools with at least one reading at or above the elevated level. */
export async function keptPoolsElevatedByMonth(versionId: number, metals: readonly Metal[]): Promise<Array<{ metal: Metal; month: string; pools: number }>> {
  // Read from the index of elevated months alone, counted per set of elevated metals, then split per metal.
  const bySet = await db()
    .select({ elevatedMetals: keptPoolMonths.elevatedMetals, month: keptPoolMonths.month, pools: count() })
    .from(keptPoolMonths)
    .where(and(eq(keptPoolMonths.versionId, versionId), gt(keptPoolMonths.elevatedMetals, 0)))
    .groupBy(keptPoolMonths.elevatedMetals, keptPoolMonths.month);
  const pools = new Map<string, { metal: Metal; month: string; pools: number }>();
  for (const row of bySet) {
    for (const metal of metals) {
      if ((row.elevatedMetals & elevatedBit(metal)) === 0) continue;
      const key = `${metal}/${row.month}`;
      const counted = pools.get(key);
      if (counted) counted.pools += row.pools;
      else pools.set(key, { metal, month: row.month, pools: row.pools });
    }
  }
  return [...pools.values()];
}

/**
 * Each pool's state per metal from the kept rows of the metal read alone:
 * open with a censored episode, last tested at the span's last test, not
 * tested without a span. Pools with no metal reading at all are left out.
 */
export async function keptMetalStates(tenant: Tenant, versionId: number, poolIds?: readonly number[]): Promise<Map<string, MetalStateOfPool>> {
  const states = new Map<string, MetalStateOfPool>();
  if (poolIds && poolIds.length === 0) return states;
  const [spans, open] = await Promise.all([
    arrayRows<[poolId: number, readAs: Metal, lastAt: number]>(
      db()
        .select({ poolId: keptPoolSpans.poolId, readAs: keptPoolSpans.readAs, lastAt: epochMs(keptPoolSpans.lastAt) })
        .from(keptPoolSpans)
        .where(and(eq(keptPoolSpans.versionId, versionId), inArray(keptPoolSpans.readAs, [...METALS]), rowsOfTenantPools(tenant, keptPoolSpans, poolIds))),
    ),
    db()
      // Each metal read alone: its own rows, and the all-metals rows that stand for them.
      .selectDistinct({ poolId: keptEpisodes.poolId, metal: keptEpisodes.metal })
      .from(keptEpisodes)
      .where(
        and(
          eq(keptEpisodes.versionId, versionId),
          or(inArray(keptEpisodes.readAs, [...METALS]), and(eq(keptEpisodes.readAs, "all"), eq(keptEpisodes.alone, true))),
          isNull(keptEpisodes.closedAt),
          rowsOfTenantPools(tenant, keptEpisodes, poolIds),
        ),
      ),
  ]);
  const openSet = new Set(open.map((o) => `${o.poolId}:${o.metal}`));
  for (const [id, metal, lastAt] of spans) {
    const poolId = String(id);
    let state = states.get(poolId);
    if (!state) states.set(poolId, (state = notTested()));
    state[metal] = { state: openSet.has(`${poolId}:${metal}`) ? "open" : "clear", lastTestedAt: Number(lastAt) };
  }
  return states;
}
