import { and, count, countDistinct, eq, isNotNull, or, sql } from "drizzle-orm";
import { classifyBalance, saturationIndex, type BalanceBand, type BalanceInputs } from "@analysis/chemistry/saturation";
import type { Metal } from "@analysis/metals/reading";
import { arrayRows } from "../../db/array-rows";
import { db } from "../../db/client";
import { utcDate } from "../../db/values";
import { keptPoolSpans, pools, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { loadMetalDataset, type MetalDataset } from "./metal-dataset";
import { computeRiskyGroups, type RiskyGroup } from "./group-figures";
import { BALANCE_COLUMNS, balanceInputsPresent } from "./balance-inputs";
import { rowsOfTenantPools, tenantCondition, testsInScope, type AnalyticsParams, type TimeWindow } from "./tenant-and-window";

export type BalanceShare = { pools: number; share: number | null };

export type RouteBookSummary = {
  source: AnswerSource;
  counts: { activePools: number; routes: number; fillSources: number; tests: number; metalTests: number; poolsTested: number };
  openEpisodes: Record<Metal, number>;
  /** Pools with two or more openings of one metal within the recurrence window. */
  recurringPools: number;
  chronicPools: number;
  /** Groups of any dimension flagged risky for a metal: rate ratio's lower bound above 1, at least 3 pools. */
  riskyGroups: RiskyGroup[];
  /** Latest test of each pool that carries pH, temperature, hardness and alkalinity. */
  balance: {
    band: BalanceBand;
    corrosive: BalanceShare;
    balanced: BalanceShare;
    scaleForming: BalanceShare;
    /** Pools whose latest complete-looking test still gave no index (e.g. zero hardness). */
    notComputable: number;
    poolsWithoutBalanceTest: number;
  };
};

/**
 * One pass over the window's tests, grouped by pool in MariaDB: how many
 * tests, how many with a metal, and when the latest test carrying all four
 * balance inputs was taken.
 */
function poolTestFigures(scope: Scope, window: TimeWindow) {
  return db()
    .select({
      poolId: waterTests.poolId,
      tests: count(),
      metalTests: sql<number>`SUM(${or(isNotNull(waterTests.copper), isNotNull(waterTests.iron), isNotNull(waterTests.manganese))})`.mapWith(Number),
      latestBalanceAt: sql<Date | null>`MAX(CASE WHEN ${balanceInputsPresent} THEN ${waterTests.sampledAt} END)`.mapWith(utcDate),
    })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(testsInScope({ scope }, window))
    .groupBy(waterTests.poolId);
}

/** The same figures from the kept spans: every test, the metal tests, the latest complete balance test. */
function keptTestFigures(dataset: MetalDataset) {
  const metalTests = new Map(dataset.history.pools.map((p) => [p.poolId, p.tests]));
  return dataset.spans.map((span) => ({
    poolId: Number(span.poolId),
    tests: span.tests,
    metalTests: metalTests.get(span.poolId) ?? 0,
    latestBalanceAt: span.latestBalanceAt ? new Date(span.latestBalanceAt) : null,
  }));
}

async function poolCounts(scope: Scope) {
  const [row] = await db()
    .select({
      active: sql<number>`SUM(${pools.active})`.mapWith(Number),
      routes: countDistinct(pools.routeId),
      sources: countDistinct(pools.fillSourceId),
    })
    .from(pools)
    .where(tenantCondition({ scope }));
  return { activePools: row?.active ?? 0, routes: row?.routes ?? 0, fillSources: row?.sources ?? 0 };
}

/** The balance inputs of each pool's latest complete test, as its kept span holds them: no test looked up. */
async function keptBalanceTests(scope: Scope, versionId: number): Promise<BalanceInputs[]> {
  const query = db()
    .select({
      ph: keptPoolSpans.balancePh,
      temperatureC: keptPoolSpans.balanceTemperatureC,
      calciumHardness: keptPoolSpans.balanceCalciumHardness,
      totalAlkalinity: keptPoolSpans.balanceTotalAlkalinity,
      cyanuricAcid: keptPoolSpans.balanceCyanuricAcid,
      tds: keptPoolSpans.balanceTds,
      salt: keptPoolSpans.balanceSalt,
    })
    .from(keptPoolSpans)
    .where(
      and(
        eq(keptPoolSpans.versionId, versionId),
        eq(keptPoolSpans.readAs, "any"),
        isNotNull(keptPoolSpans.latestBalanceAt),
        rowsOfTenantPools({ scope }, keptPoolSpans),
      ),
    );
  type Row = [ph: number, temperatureC: number, calciumHardness: number, totalAlkalinity: number, cyanuricAcid: number | null, tds: number | null, salt: number | null];
  return (await arrayRows<Row>(query)).map(([ph, temperatureC, calciumHardness, totalAlkalinity, cyanuricAcid, tds, salt]) => ({
    ph: Number(ph),
    temperatureC: Number(temperatureC),
    calciumHardness: Number(calciumHardness),
    totalAlkalinity: Number(totalAlkalinity),
    cyanuricAcid: cyanuricAcid === null ? null : Number(cyanuricAcid),
    tds: tds === null ? null : Number(tds),
    salt: salt === null ? null : Number(salt),
  }));
}

/**
 * The balance inputs of each pool's latest complete test, read by the
 * (pool, time) key the grouped pass found: one indexed lookup per pool. Of
 * two complete tests at that instant the last entered counts, once, as the
 * kept spans keep it.
 */
async function balanceTestsAt(scope: Scope, latest: ReadonlyArray<{ poolId: number; at: Date }>): Promise<BalanceInputs[]> {
  if (latest.length === 0) return [];
  const rows = await db()
    .select({ id: waterTests.id, poolId: waterTests.poolId, ...BALANCE_COLUMNS })
    .from(waterTests)
    .where(
      and(
        tenantCondition({ companyId: scope.companyId }, waterTests.companyId),
        balanceInputsPresent,
        or(...latest.map((l) => and(eq(waterTests.poolId, l.poolId), eq(waterTests.sampledAt, l.at)))),
      ),
    );
  const lastEntered = new Map<number, (typeof rows)[number]>();
  for (const row of rows) if (Number(row.id) > Number(lastEntered.get(row.poolId)?.id ?? -1)) lastEntered.set(row.poolId, row);
  return [...lastEntered.values()];
}

export async function routeBookSummary(
  scope: Scope,
  params: AnalyticsParams & { balanceBand: BalanceBand },
  loaded?: MetalDataset,
): Promise<RouteBookSummary> {
  // With kept results, the balance tests are found through the kept spans while the rest is read.
  const versionId = loaded ? (loaded.versionId ?? null) : await keptVersionFor(scope.companyId, params);
  const [poolFigures, dataset, keptBalance] = await Promise.all([
    poolCounts(scope),
    loaded ?? loadMetalDataset(scope, { ...params, metal: null }, versionId),
    versionId === null ? null : keptBalanceTests(scope, versionId),
  ]);
  const perPool = dataset.source === "kept" ? keptTestFigures(dataset) : await poolTestFigures(scope, params.window);
  const latest = perPool.flatMap((p) => (p.latestBalanceAt ? [{ poolId: p.poolId, at: p.latestBalanceAt }] : []));
  const balanceRows = keptBalance ?? (await balanceTestsAt(scope, latest));
  const figures = {
    ...poolFigures,
    tests: perPool.reduce((sum, p) => sum + p.tests, 0),
    metalTests: perPool.reduce((sum, p) => sum + p.metalTests, 0),
    poolsTested: perPool.length,
  };
  const metalHistory = dataset.history;
  const openEpisodes = { copper: 0, iron: 0, manganese: 0 } satisfies Record<Metal, number>;
  const chronic = new Set<string>();
  for (const e of metalHistory.episodes) {
    if (e.censored) openEpisodes[e.metal]++;
    if (e.chronic) chronic.add(e.poolId);
  }
  const recurring = new Set(metalHistory.recurrence.filter((r) => r.recurrent).map((r) => r.poolId));

  const tally = { corrosive: 0, balanced: 0, "scale-forming": 0 };
  let notComputable = 0;
  for (const row of balanceRows) {
    const result = saturationIndex(row);
    if (result.ok) tally[classifyBalance(result.index, params.balanceBand)]++;
    else notComputable++;
  }
  const classified = tally.corrosive + tally.balanced + tally["scale-forming"];
  const share = (n: number): BalanceShare => ({ pools: n, share: classified > 0 ? n / classified : null });
  return {
    source: dataset.source,
    counts: figures,
    openEpisodes,
    recurringPools: recurring.size,
    chronicPools: chronic.size,
    riskyGroups: computeRiskyGroups(dataset),
    balance: {
      band: params.balanceBand,
      corrosive: share(tally.corrosive),
      balanced: share(tally.balanced),
      scaleForming: share(tally["scale-forming"]),
      notComputable,
      poolsWithoutBalanceTest: Math.max(0, figures.poolsTested - balanceRows.length),
    },
  };
}
