import { and, asc, count, eq, inArray, sql } from "drizzle-orm";
import type { MetalTest } from "@analysis/metals/episodes";
import { METALS, metalStatus, type Metal, type MetalReading, type MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { fillSources, pools, routes } from "../../db/schema";
import type { Scope } from "../../scope";
import { sourceAlertsWithReadings, type SourceAlert } from "./shared-source-alerts";
import { sourceTestRows } from "./fill-water-tests";
import { tenantCondition, type AnalyticsParams } from "./tenant-and-window";

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
 * from readings ordered by pool and time. An episode is open when the last
 * elevated reading is later than the last clear one: only a clear reading
 * closes it.
 */
function poolMetalStates(readings: readonly MetalTest[], poolIds: ReadonlySet<number>, thresholds: MetalThresholds) {
  type Seen = { last: number | null; clear: number | null; elevated: number | null };
  const seenByPool = new Map<number, Record<Metal, Seen>>();
  for (const r of readings) {
    const poolId = Number(r.poolId);
    if (!poolIds.has(poolId)) continue;
    let seen = seenByPool.get(poolId);
    if (!seen) {
      seen = Object.fromEntries(METALS.map((m) => [m, { last: null, clear: null, elevated: null }])) as unknown as Record<Metal, Seen>;
      seenByPool.set(poolId, seen);
    }
    for (const metal of METALS) {
      const reading = r[metal];
      if (!reading) continue;
      const s = seen[metal];
      s.last = r.takenAt;
      const status = metalStatus(reading, thresholds[metal]);
      if (status === "clear") s.clear = r.takenAt;
      else if (status === "elevated") s.elevated = r.takenAt;
    }
  }
  const states = new Map<number, SourceHealthPool["metals"]>();
  for (const [poolId, seen] of seenByPool) {
    const metals = {} as SourceHealthPool["metals"];
    for (const metal of METALS) {
      const { last, clear, elevated } = seen[metal];
      const state: PoolMetalState = last === null ? "not-tested" : elevated !== null && (clear === null || elevated > clear) ? "open" : "clear";
      metals[metal] = { state, lastTestedAt: last === null ? null : new Date(last).toISOString() };
    }
    states.set(poolId, metals);
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
    .where(and(tenantCondition({ scope }), eq(pools.active, true)))
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
  // One read of every metal serves both the alerts and the pools' metal state.
  const [active, tests, alerts, routeNames] = await Promise.all([
    db()
      .select({ sourceId: pools.fillSourceId, n: count() })
      .from(pools)
      .where(and(tenantCondition({ companyId: scope.companyId }), eq(pools.active, true), inArray(pools.fillSourceId, sourceIds)))
      .groupBy(pools.fillSourceId),
    sourceTestRows(scope.companyId, sourceIds),
    sourceAlertsWithReadings(scope, params, METALS),
    db().select({ id: routes.id, name: routes.name }).from(routes).where(eq(routes.companyId, scope.companyId)),
  ]);
  const states = poolMetalStates(alerts.readings, new Set(onSources.map((p) => p.id)), params.thresholds);
  const routeName = new Map(routeNames.map((r) => [r.id, r.name]));
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
