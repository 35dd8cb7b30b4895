import { and, count, eq, inArray, max, sql } from "drizzle-orm";
import { METALS, type Metal, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { pools, routes, waterTests } from "../../db/schema";
import { utcDate } from "../../db/values";
import { activePoolsInScope, type Scope, poolsInScope } from "../../scope";
import { poolStopColumns } from "./pools";

export type OpenMetalCase = {
  poolId: number;
  customerName: string;
  street: string;
  metal: Metal;
  lastElevatedAt: Date;
  lastElevatedValue: number;
};

export type HomeSummary = {
  pools: number;
  routes: number;
  tests: number;
  testsLast30Days: number;
  lastTestAt: Date | null;
  openCasesByMetal: Record<Metal, number>;
  openCases: OpenMetalCase[];
};

function metalColumns(metal: Metal) {
  const value = sql.raw(`t.${metal}`);
  const belowDetection = sql.raw(`t.${metal}_below_detection`);
  return { value, belowDetection };
}

/**
 * A pool's episode of a metal is open when its latest elevated reading comes
 * after its latest clear one: only a clear reading closes an episode, readings
 * in between keep it open. A "<x" reading counts as clear only when x is at or
 * below the clear level.
 */
async function openCases(scope: Scope, thresholds: MetalThresholds): Promise<OpenMetalCase[]> {
  const aggregates = METALS.map((metal) => {
    const { value, belowDetection } = metalColumns(metal);
    const { elevated, clear } = thresholds[metal];
    return sql`
      MAX(CASE WHEN ${value} IS NOT NULL AND (
            (${belowDetection} = 1 AND ${value} <= ${clear}) OR (${belowDetection} = 0 AND ${value} < ${clear}))
          THEN t.sampled_at END) AS ${sql.raw(`${metal}_last_clear`)},
      MAX(CASE WHEN ${belowDetection} = 0 AND ${value} >= ${elevated} THEN t.sampled_at END) AS ${sql.raw(`${metal}_last_elevated`)}`;
  });
  const [rows] = (await db().execute(sql`
    SELECT pools.id AS pool_id, pools.customer_name, pools.street, ${sql.join(aggregates, sql`, `)}
    FROM water_tests t
    JOIN pools ON pools.id = t.pool_id
    WHERE ${poolsInScope(scope)} AND t.company_id = ${scope.companyId}
    GROUP BY pools.id, pools.customer_name, pools.street
  `)) as unknown as [Array<Record<string, unknown>>];

  const candidates: Array<Omit<OpenMetalCase, "lastElevatedValue">> = [];
  for (const row of rows) {
    for (const metal of METALS) {
      const lastElevated = utcDate(row[`${metal}_last_elevated`]);
      const lastClear = utcDate(row[`${metal}_last_clear`]);
      if (lastElevated && (!lastClear || lastElevated > lastClear)) {
        candidates.push({
          poolId: Number(row.pool_id),
          customerName: String(row.customer_name),
          street: String(row.street),
          metal,
          lastElevatedAt: lastElevated,
        });
      }
    }
  }
  if (candidates.length === 0) return [];
  const values = await db()
    .select({
      poolId: waterTests.poolId,
      sampledAt: waterTests.sampledAt,
      copper: waterTests.copper,
      iron: waterTests.iron,
      manganese: waterTests.manganese,
    })
    .from(waterTests)
    .where(
      sql`(${waterTests.poolId}, ${waterTests.sampledAt}) IN (${sql.join(
        candidates.map((c) => sql`(${c.poolId}, ${c.lastElevatedAt})`),
        sql`, `,
      )})`,
    );
  const byKey = new Map(values.map((v) => [`${v.poolId}@${v.sampledAt.getTime()}`, v]));
  return candidates
    .map((c) => ({
      ...c,
      lastElevatedValue: Number(byKey.get(`${c.poolId}@${c.lastElevatedAt.getTime()}`)?.[c.metal] ?? Number.NaN),
    }))
    .sort((a, b) => b.lastElevatedAt.getTime() - a.lastElevatedAt.getTime());
}

export async function homeSummary(scope: Scope, thresholds: MetalThresholds, now = new Date()): Promise<HomeSummary> {
  const since = new Date(now.getTime() - 30 * 86_400_000);
  const [poolCount] = await db().select({ n: count() }).from(pools).where(activePoolsInScope(scope));
  // Routes in use: archived ones keep their history but are no longer worked.
  const routesInScope =
    scope.routeIds === null
      ? undefined
      : scope.routeIds.length === 0
        ? sql`false`
        : inArray(routes.id, scope.routeIds);
  const [routeRow] = await db()
    .select({ n: count() })
    .from(routes)
    .where(and(eq(routes.companyId, scope.companyId), eq(routes.active, true), routesInScope));
  const routeCount = routeRow?.n ?? 0;
  const [testFigures] = await db()
    .select({
      tests: count(),
      recent: sql<number>`SUM(${waterTests.sampledAt} >= ${since})`.mapWith(Number),
      last: max(waterTests.sampledAt),
    })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(and(poolsInScope(scope), eq(waterTests.companyId, scope.companyId)));
  const cases = await openCases(scope, thresholds);
  const openCasesByMetal = { copper: 0, iron: 0, manganese: 0 } satisfies Record<Metal, number>;
  for (const c of cases) openCasesByMetal[c.metal] += 1;
  return {
    pools: poolCount?.n ?? 0,
    routes: routeCount,
    tests: testFigures?.tests ?? 0,
    testsLast30Days: testFigures?.recent ?? 0,
    lastTestAt: utcDate(testFigures?.last),
    openCasesByMetal,
    openCases: cases,
  };
}

export type TodayStop = {
  poolId: number;
  customerName: string;
  street: string;
  neighbourhood: string | null;
  routeName: string;
  lastVisitAt: Date | null;
};

/** Pools whose route is served on the given ISO weekday (1 = Monday), in the member's scope; archived routes have no day. */
export async function stopsForWeekday(scope: Scope, isoWeekday: number): Promise<TodayStop[]> {
  const rows = await db()
    .select({
      ...poolStopColumns,
      // The (pool_id, sampled_at) index answers this per pool without a scan.
      lastVisitAt: sql<Date | null>`(SELECT MAX(w.sampled_at) FROM water_tests w WHERE w.pool_id = ${pools.id})`,
    })
    .from(pools)
    .innerJoin(routes, eq(routes.id, pools.routeId))
    .where(
      and(
        activePoolsInScope(scope),
        eq(routes.active, true),
        sql`FIND_IN_SET(${String(isoWeekday)}, ${routes.serviceWeekdays}) > 0`,
      ),
    )
    .orderBy(routes.name, pools.neighbourhood, pools.street);
  return rows.map((r) => ({ ...r, lastVisitAt: utcDate(r.lastVisitAt) }));
}
