import { group } from "d3-array";
import { and, asc, count, eq, inArray } from "drizzle-orm";
import { notTested, poolMetalStates, type MetalStateOfPool, type PoolMetalState } from "@analysis/metals/metal-state";
import { METALS, type Metal, type MetalReading } from "@analysis/metals/reading";
import { isoInstant } from "@analysis/json-shapes";
import { db } from "../../db/client";
import { fillSources, pools, routes } from "../../db/schema";
import type { Scope } from "../../scope";
import { keptMetalStates, keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { sharedSourceAlertList, sourceAlertsWithReadings, type SourceAlert } from "./shared-source-alerts";
import { sourceTestRows } from "./fill-water-tests";
import { tenantCondition, type AnalyticsParams } from "./tenant-and-window";

export type { PoolMetalState };

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

export type SourceHealthReport = { sources: SourceHealth[]; flaggedPoolsInScope: number; source: AnswerSource };

function metalsJson(state: MetalStateOfPool): SourceHealthPool["metals"] {
  const json = {} as SourceHealthPool["metals"];
  for (const metal of METALS) json[metal] = { state: state[metal].state, lastTestedAt: isoInstant(state[metal].lastTestedAt) };
  return json;
}

/**
 * The shared-source alerts and each pool's metal state: from the kept rows
 * when a kept version answers (no reading is read), else from one read of
 * every metal of the company's pools on the sources, which serves both.
 */
async function alertsAndStates(scope: Scope, params: AnalyticsParams, versionId: number | null, poolIds: readonly number[]) {
  if (versionId !== null) {
    const [alerts, states] = await Promise.all([
      sharedSourceAlertList(scope, params, versionId),
      keptMetalStates({ scope }, versionId, poolIds),
    ]);
    return { alerts: alerts.alerts, states, source: "kept" as const };
  }
  const alerts = await sourceAlertsWithReadings(scope, params, METALS);
  return { alerts: alerts.alerts, states: poolMetalStates(alerts.readings, params.thresholds), source: "recomputed" as const };
}

/**
 * Every fill source the member may see (a technician: the sources of their
 * own pools) with its pools in scope and their metal state, its fill-water
 * tests and its shared-source alerts.
 */
export async function sourceHealth(scope: Scope, params: AnalyticsParams): Promise<SourceHealthReport> {
  const activeInScope = and(tenantCondition({ scope }), eq(pools.active, true));
  const technician = scope.routeIds !== null;
  const [scopedPools, sources, versionId, routeNames] = await Promise.all([
    db()
      .select({ id: pools.id, street: pools.street, fillSourceId: pools.fillSourceId, routeId: pools.routeId })
      .from(pools)
      .where(activeInScope)
      .orderBy(asc(pools.street)),
    db()
      .select({ id: fillSources.id, name: fillSources.name, kind: fillSources.kind })
      .from(fillSources)
      .where(
        and(
          eq(fillSources.companyId, scope.companyId),
          technician ? inArray(fillSources.id, db().selectDistinct({ id: pools.fillSourceId }).from(pools).where(activeInScope)) : undefined,
        ),
      )
      .orderBy(asc(fillSources.name)),
    keptVersionFor(scope.companyId, params),
    db().select({ id: routes.id, name: routes.name }).from(routes).where(eq(routes.companyId, scope.companyId)),
  ]);
  const sourceIds = sources.map((s) => s.id);
  if (sourceIds.length === 0) return { sources: [], flaggedPoolsInScope: 0, source: versionId === null ? "recomputed" : "kept" };

  const onSources = scopedPools.filter((p) => p.fillSourceId !== null);
  const [active, tests, found] = await Promise.all([
    db()
      .select({ sourceId: pools.fillSourceId, n: count() })
      .from(pools)
      .where(and(tenantCondition({ companyId: scope.companyId }), eq(pools.active, true), inArray(pools.fillSourceId, sourceIds)))
      .groupBy(pools.fillSourceId),
    sourceTestRows(scope.companyId, sourceIds),
    alertsAndStates(scope, params, versionId, onSources.map((p) => p.id)),
  ]);
  const routeName = new Map(routeNames.map((r) => [r.id, r.name]));
  const activeBySource = new Map(active.map((a) => [a.sourceId, a.n]));
  // Grouped once: a large route book has hundreds of sources and thousands of pools.
  const alertsBySource = group(found.alerts, (a) => a.fillSourceId);
  const poolsBySource = group(onSources, (p) => p.fillSourceId);
  const testsBySource = group(tests, (t) => t.fillSourceId);
  let flaggedPoolsInScope = 0;
  const report = sources.map((s) => {
    const sourceAlerts = alertsBySource.get(s.id) ?? [];
    const sourcePools = (poolsBySource.get(s.id) ?? []).map((p) => ({
      poolId: p.id,
      street: p.street,
      routeName: p.routeId === null ? null : (routeName.get(p.routeId) ?? null),
      metals: metalsJson(found.states.get(String(p.id)) ?? notTested()),
    }));
    const flagged = sourceAlerts.length > 0;
    if (flagged) flaggedPoolsInScope += sourcePools.length;
    return {
      fillSourceId: s.id,
      name: s.name,
      kind: s.kind,
      activePools: activeBySource.get(s.id) ?? 0,
      pools: sourcePools,
      sourceTests: (testsBySource.get(s.id) ?? []).map((t) => ({ sampledOn: t.sampledOn, copper: t.copper, iron: t.iron, manganese: t.manganese })),
      alerts: sourceAlerts,
      flagged,
    };
  });
  // Flagged sources first, then by name.
  report.sort((a, b) => Number(b.flagged) - Number(a.flagged) || a.name.localeCompare(b.name));
  return { sources: report, flaggedPoolsInScope, source: found.source };
}
