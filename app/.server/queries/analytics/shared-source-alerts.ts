import { and, count, eq, inArray, isNotNull } from "drizzle-orm";
import { analyseMetalHistory } from "@analysis/metals/episodes";
import { METALS, type Metal } from "@analysis/metals/reading";
import { sharedSourceAlerts, type SharedSourceAlert } from "@analysis/metals/shared-source";
import { isoInstant } from "~/lib/analytics/json";
import { db } from "../../db/client";
import { fillSources, pools } from "../../db/schema";
import type { Scope } from "../../guard";
import { poolsInScope } from "../scope";
import { metalReadings } from "../metal-readings";
import { poolProfiles } from "./rows";
import type { AnalyticsParams } from "./window";

export type SourceAlert = {
  fillSourceId: number;
  sourceName: string;
  sourceKind: string;
  metal: Metal;
  firstOpeningAt: string;
  lastOpeningAt: string;
  /** Pools on the source that opened an episode in the cluster (company-wide). */
  poolCount: number;
  activePools: number;
  poolsRequired: number;
  /** Only the pools in the member's scope are named; the rest are counted. */
  pools: Array<{ poolId: number; street: string }>;
  poolsOutsideScope: number;
};

export type SharedSourceAlerts = { alerts: SourceAlert[]; sourcesWatched: number };

/**
 * Shared-source alerts for the fill sources of the member's pools.
 *
 * The rule counts every pool on a source, so it is computed on the whole
 * company's pools of those sources, not just a technician's routes; what
 * leaves this function names only the pools in the member's scope and
 * counts the others, so no other route's customer is revealed.
 */
export async function sharedSourceAlertList(
  scope: Scope,
  params: AnalyticsParams & { sourceIds?: readonly number[] },
): Promise<SharedSourceAlerts> {
  const visibleSources = await db()
    .selectDistinct({ id: pools.fillSourceId })
    .from(pools)
    .where(
      and(
        poolsInScope(scope),
        isNotNull(pools.fillSourceId),
        params.sourceIds ? inArray(pools.fillSourceId, [...params.sourceIds]) : undefined,
      ),
    );
  const sourceIds = visibleSources.map((s) => s.id!).filter((id) => id !== null);
  if (sourceIds.length === 0) return { alerts: [], sourcesWatched: 0 };

  const companyScope: Scope = { ...scope, routeIds: null };
  const [sourcePools, sources, active] = await Promise.all([
    db()
      .select({ id: pools.id })
      .from(pools)
      .where(and(eq(pools.companyId, scope.companyId), inArray(pools.fillSourceId, sourceIds))),
    db()
      .select({ id: fillSources.id, name: fillSources.name, kind: fillSources.kind })
      .from(fillSources)
      .where(and(eq(fillSources.companyId, scope.companyId), inArray(fillSources.id, sourceIds))),
    db()
      .select({ sourceId: pools.fillSourceId, n: count() })
      .from(pools)
      .where(and(eq(pools.companyId, scope.companyId), eq(pools.active, true), inArray(pools.fillSourceId, sourceIds)))
      .groupBy(pools.fillSourceId),
  ]);
  const poolIds = sourcePools.map((p) => p.id);
  const metals = params.metal ? [params.metal] : METALS;
  const [readings, book, visible] = await Promise.all([
    metalReadings({ scope: companyScope }, { window: params.window, metals, poolIds }),
    poolProfiles(companyScope, { poolIds }),
    db().select({ id: pools.id, street: pools.street }).from(pools).where(and(poolsInScope(scope), inArray(pools.id, poolIds))),
  ]);
  const history = analyseMetalHistory(readings, { thresholds: params.thresholds, metals });
  const activePools = new Map(active.map((a) => [String(a.sourceId), a.n]));
  const found = sharedSourceAlerts(history.episodes, book.profiles, { activePools });
  return { alerts: found.map((a) => describe(a, sources, visible)).reverse(), sourcesWatched: sourceIds.length };
}

function describe(
  alert: SharedSourceAlert,
  sources: ReadonlyArray<{ id: number; name: string; kind: string }>,
  visible: ReadonlyArray<{ id: number; street: string }>,
): SourceAlert {
  const source = sources.find((s) => String(s.id) === alert.fillSourceId);
  const streets = new Map(visible.map((p) => [String(p.id), p.street]));
  const named = alert.poolIds.filter((id) => streets.has(id));
  return {
    fillSourceId: Number(alert.fillSourceId),
    sourceName: source?.name ?? "",
    sourceKind: source?.kind ?? "other",
    metal: alert.metal,
    firstOpeningAt: isoInstant(alert.firstOpeningAt)!,
    lastOpeningAt: isoInstant(alert.lastOpeningAt)!,
    poolCount: alert.poolIds.length,
    activePools: alert.activePools,
    poolsRequired: alert.poolsRequired,
    pools: named.map((id) => ({ poolId: Number(id), street: streets.get(id)! })),
    poolsOutsideScope: alert.poolIds.length - named.length,
  };
}
