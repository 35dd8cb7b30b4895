import { and, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { analyseMetalHistory, type Episode, type MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal } from "@analysis/metals/reading";
import { sharedSourceAlerts, type SharedSourceAlert } from "@analysis/metals/shared-source";
import { isoInstant } from "@analysis/json-shapes";
import { db } from "../../db/client";
import { fillSources, pools } from "../../db/schema";
import { poolsInScope, type Scope } from "../../scope";
import { keptEpisodeList, keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { metalReadings } from "./metal-readings";
import { tenantCondition, type AnalyticsParams } from "./tenant-and-window";

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

export type SharedSourceAlerts = { alerts: SourceAlert[]; sourcesWatched: number; source?: AnswerSource };

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
  /** The kept version a caller already chose for the rest of its answer (null: recompute), so one answer reads one version. */
  keptVersion?: number | null,
): Promise<SharedSourceAlerts> {
  const versionId = keptVersion === undefined ? await keptVersionFor(scope.companyId, params) : keptVersion;
  if (versionId !== null) {
    const { alerts, sourcesWatched } = await sourceAlertsFrom(scope, params, (poolIds) => keptEpisodeList({ companyId: scope.companyId }, versionId, params.metal ?? "all", poolIds));
    return { alerts, sourcesWatched, source: "kept" };
  }
  const { alerts, sourcesWatched } = await sourceAlertsWithReadings(scope, params, params.metal ? [params.metal] : METALS);
  return { alerts, sourcesWatched, source: "recomputed" };
}

/** Readings kept to one metal, as they would have been read for it alone. */
function onlyMetal(readings: readonly MetalTest[], metal: Metal): MetalTest[] {
  const kept: MetalTest[] = [];
  for (const r of readings) {
    if (!r[metal]) continue;
    kept.push({ ...r, copper: null, iron: null, manganese: null, [metal]: r[metal] });
  }
  return kept;
}

/**
 * The alerts, and the readings they were worked out from: every pool of the
 * company on the watched sources, with the metals asked to be read (at least
 * the alert's metal), so a caller needing the same rows does not read them again.
 */
export async function sourceAlertsWithReadings(
  scope: Scope,
  params: AnalyticsParams & { sourceIds?: readonly number[] },
  metalsToRead: readonly Metal[],
): Promise<SharedSourceAlerts & { readings: MetalTest[] }> {
  let readings: MetalTest[] = [];
  const metals = params.metal ? [params.metal] : METALS;
  const found = await sourceAlertsFrom(scope, params, async (poolIds) => {
    readings = await metalReadings({ companyId: scope.companyId }, { window: params.window, metals: params.metal ? metalsToRead : METALS, poolIds });
    const alertReadings = params.metal && metalsToRead.some((m) => m !== params.metal) ? onlyMetal(readings, params.metal) : readings;
    return analyseMetalHistory(alertReadings, { thresholds: params.thresholds, metals }).episodes;
  });
  return { ...found, readings };
}

/** The alerts of the watched sources, from the episodes of every pool of the company on them. */
async function sourceAlertsFrom(
  scope: Scope,
  params: AnalyticsParams & { sourceIds?: readonly number[] },
  episodesOf: (poolIds: number[]) => Promise<Episode[]>,
): Promise<SharedSourceAlerts> {
  // The sources of the member's pools, as a subquery: the reads below need not wait for their ids.
  const visibleSources = db()
    .selectDistinct({ id: pools.fillSourceId })
    .from(pools)
    .where(
      and(
        tenantCondition({ scope }),
        isNotNull(pools.fillSourceId),
        params.sourceIds ? inArray(pools.fillSourceId, [...params.sourceIds]) : undefined,
      ),
    );
  const companyWide = { companyId: scope.companyId };
  const [sourcePools, sources] = await Promise.all([
    db()
      .select({
        id: pools.id,
        fillSourceId: pools.fillSourceId,
        active: pools.active,
        street: pools.street,
        // 1 when the member may see the pool (NULL, not 0, for a pool on no route).
        inScope: sql<number | null>`${poolsInScope(scope)}`,
      })
      .from(pools)
      .where(and(tenantCondition(companyWide), inArray(pools.fillSourceId, visibleSources))),
    db()
      .select({ id: fillSources.id, name: fillSources.name, kind: fillSources.kind })
      .from(fillSources)
      .where(and(eq(fillSources.companyId, scope.companyId), inArray(fillSources.id, visibleSources))),
  ]);
  if (sources.length === 0) return { alerts: [], sourcesWatched: 0 };

  const episodes = await episodesOf(sourcePools.map((p) => p.id));
  const activePools = new Map<string, number>();
  for (const p of sourcePools) if (p.active) activePools.set(String(p.fillSourceId), (activePools.get(String(p.fillSourceId)) ?? 0) + 1);
  const onSources = sourcePools.map((p) => ({ poolId: String(p.id), fillSourceId: String(p.fillSourceId) }));
  const found = sharedSourceAlerts(episodes, onSources, { activePools });
  // Streets only of the pools in the member's scope: the alerts name no other.
  const streets = new Map(sourcePools.filter((p) => Number(p.inScope) === 1).map((p) => [String(p.id), p.street]));
  const sourceById = new Map(sources.map((s) => [String(s.id), s]));
  return { alerts: found.map((a) => describe(a, sourceById, streets)).reverse(), sourcesWatched: sources.length };
}

function describe(
  alert: SharedSourceAlert,
  sources: ReadonlyMap<string, { name: string; kind: string }>,
  streets: ReadonlyMap<string, string>,
): SourceAlert {
  const source = sources.get(alert.fillSourceId);
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
