import { and, asc, count, eq, inArray, sql } from "drizzle-orm";
import { METALS, type Metal, type MetalReading } from "@analysis/metals/reading";
import { utcDate } from "../../db/values";
import { db } from "../../db/client";
import { fillSources, pools } from "../../db/schema";
import type { Scope } from "../../guard";
import { poolsInScope } from "../scope";
import { sharedSourceAlertList, type SourceAlert } from "./shared-source-alerts";
import { sourceTestRows } from "./rows";
import type { AnalyticsParams } from "./window";

export type PoolMetalState = "open" | "clear" | "not-tested";

export type SourceHealthPool = {
  poolId: number;
  street: string;
  routeName: string | null;
  metals: Record<Metal, { state: PoolMetalState; lastTestedAt: string | null }>;
};

export type SourceHealth = {
  fillSourceId: number;
  name: string;
  kind: string;
  /** Active pools on the source across the company. */
  activePools: number;
  pools: SourceHealthPool[];
  sourceTests: Array<{ sampledOn: string; copper: MetalReading | null; iron: MetalReading | null; manganese: MetalReading | null }>;
  alerts: SourceAlert[];
  flagged: boolean;
};

export type SourceHealthReport = { sources: SourceHealth[]; flaggedPoolsInScope: number };

/**
 * Per pool and metal, the last elevated, last clear and last tested time,
 * grouped in MariaDB (one row per pool). An episode is open when the last
 * elevated reading is later than the last clear one: only a clear reading
 * closes it.
 */
async function poolMetalStates(scope: Scope, poolIds: readonly number[], params: AnalyticsParams) {
  if (poolIds.length === 0) return new Map<number, SourceHealthPool["metals"]>();
  const columns = METALS.map((metal) => {
    const value = sql.raw(`t.${metal}`);
    const below = sql.raw(`t.${metal}_below_detection`);
    const { elevated, clear } = params.thresholds[metal];
    return sql`
      MAX(CASE WHEN ${value} IS NOT NULL THEN t.sampled_at END) AS ${sql.raw(`${metal}_last`)},
      MAX(CASE WHEN ${value} IS NOT NULL AND ((${below} = 1 AND ${value} <= ${clear}) OR (${below} = 0 AND ${value} < ${clear})) THEN t.sampled_at END) AS ${sql.raw(`${metal}_clear`)},
      MAX(CASE WHEN ${below} = 0 AND ${value} >= ${elevated} THEN t.sampled_at END) AS ${sql.raw(`${metal}_elevated`)}`;
  });
  const [rows] = (await db().execute(sql`
    SELECT t.pool_id, ${sql.join(columns, sql`, `)}
    FROM water_tests t JOIN pools ON pools.id = t.pool_id
    WHERE ${poolsInScope(scope)} AND t.company_id = ${scope.companyId}
      AND t.pool_id IN (${sql.join(poolIds.map((id) => sql`${id}`), sql`, `)})
      ${params.window.from ? sql`AND t.sampled_at >= ${params.window.from}` : sql``}
      ${params.window.to ? sql`AND t.sampled_at <= ${params.window.to}` : sql``}
    GROUP BY t.pool_id
  `)) as unknown as [Array<Record<string, unknown>>];
  const states = new Map<number, SourceHealthPool["metals"]>();
  for (const row of rows) {
    const metals = {} as SourceHealthPool["metals"];
    for (const metal of METALS) {
      const last = utcDate(row[`${metal}_last`]);
      const lastClear = utcDate(row[`${metal}_clear`]);
      const lastElevated = utcDate(row[`${metal}_elevated`]);
      const state: PoolMetalState = !last ? "not-tested" : lastElevated && (!lastClear || lastElevated > lastClear) ? "open" : "clear";
      metals[metal] = { state, lastTestedAt: last?.toISOString() ?? null };
    }
    states.set(Number(row.pool_id), metals);
  }
  return states;
}

const untested = (): SourceHealthPool["metals"] => ({
  copper: { state: "not-tested", lastTestedAt: null },
  iron: { state: "not-tested", lastTestedAt: null },
  manganese: { state: "not-tested", lastTestedAt: null },
});

/**
 * Every fill source the member may see (a technician: the sources of their
 * own pools) with its pools in scope and their metal state, its fill-water
 * tests and its shared-source alerts.
 */
export async function sourceHealth(scope: Scope, params: AnalyticsParams): Promise<SourceHealthReport> {
  const scopedPools = await db()
    .select({ id: pools.id, street: pools.street, fillSourceId: pools.fillSourceId, routeId: pools.routeId })
    .from(pools)
    .where(and(poolsInScope(scope), eq(pools.active, true)))
    .orderBy(asc(pools.street));
  const technician = scope.routeIds !== null;
  const ownSourceIds = [...new Set(scopedPools.map((p) => p.fillSourceId).filter((id): id is number => id !== null))];
  const sources = await db()
    .select({ id: fillSources.id, name: fillSources.name, kind: fillSources.kind })
    .from(fillSources)
    .where(
      and(
        eq(fillSources.companyId, scope.companyId),
        technician ? (ownSourceIds.length ? inArray(fillSources.id, ownSourceIds) : sql`false`) : undefined,
      ),
    )
    .orderBy(asc(fillSources.name));
  const sourceIds = sources.map((s) => s.id);
  if (sourceIds.length === 0) return { sources: [], flaggedPoolsInScope: 0 };

  const onSources = scopedPools.filter((p) => p.fillSourceId !== null);
  const [active, tests, alerts, states, routeNames] = await Promise.all([
    db()
      .select({ sourceId: pools.fillSourceId, n: count() })
      .from(pools)
      .where(and(eq(pools.companyId, scope.companyId), eq(pools.active, true), inArray(pools.fillSourceId, sourceIds)))
      .groupBy(pools.fillSourceId),
    sourceTestRows(scope.companyId, sourceIds),
    sharedSourceAlertList(scope, params),
    poolMetalStates(scope, onSources.map((p) => p.id), params),
    db().execute(sql`SELECT id, name FROM routes WHERE company_id = ${scope.companyId}`) as unknown as Promise<[Array<{ id: number; name: string }>]>,
  ]);
  const routeName = new Map(routeNames[0].map((r) => [Number(r.id), String(r.name)]));
  const activeBySource = new Map(active.map((a) => [a.sourceId, a.n]));
  let flaggedPoolsInScope = 0;
  const report = sources.map((s) => {
    const sourceAlerts = alerts.alerts.filter((a) => a.fillSourceId === s.id);
    const sourcePools = onSources
      .filter((p) => p.fillSourceId === s.id)
      .map((p) => ({
        poolId: p.id,
        street: p.street,
        routeName: p.routeId === null ? null : (routeName.get(p.routeId) ?? null),
        metals: states.get(p.id) ?? untested(),
      }));
    const flagged = sourceAlerts.length > 0;
    if (flagged) flaggedPoolsInScope += sourcePools.length;
    return {
      fillSourceId: s.id,
      name: s.name,
      kind: s.kind,
      activePools: activeBySource.get(s.id) ?? 0,
      pools: sourcePools,
      sourceTests: tests
        .filter((t) => t.fillSourceId === s.id)
        .map((t) => ({ sampledOn: t.sampledOn, copper: t.copper, iron: t.iron, manganese: t.manganese })),
      alerts: sourceAlerts,
      flagged,
    };
  });
  // Flagged sources first, then by name.
  report.sort((a, b) => Number(b.flagged) - Number(a.flagged) || a.name.localeCompare(b.name));
  return { sources: report, flaggedPoolsInScope };
}
