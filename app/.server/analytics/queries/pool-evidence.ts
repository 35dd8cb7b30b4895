import { likelySourceEvidence, type Evidence, type FillSourceTest } from "@analysis/metals/likely-source";
import type { BalanceBand } from "@analysis/chemistry/saturation";
import type { SharedSourceAlert } from "@analysis/metals/shared-source";
import { episodeJson, isoInstant, type EpisodeJson } from "@analysis/json-shapes";
import type { Scope } from "../../scope";
import { keptVersionFor, type AnswerSource } from "../kept/read-kept";
import { poolBalance, poolEpisodes, poolInScope } from "./pool-series";
import { treatmentRows } from "./metal-readings";
import { dayToMs } from "../../db/values";
import { companyPreferences } from "../../settings/queries/company-settings";
import { sourceTestRows } from "./fill-water-tests";
import { poolProfiles } from "./pool-profiles";
import { sharedSourceAlertList } from "./shared-source-alerts";
import { ALL_TIME, type AnalyticsParams } from "./tenant-and-window";
import { formatDate } from "~/lib/format";

export type EpisodeEvidence = EpisodeJson & { evidence: Array<{ kind: Evidence["kind"]; reason: string; at: string | null }> };

export type PoolEvidence = {
  poolId: number;
  episodes: EpisodeEvidence[];
  openEpisodes: number;
  /** Where the episodes came from; the evidence is read for the pool either way. */
  source: AnswerSource;
  note: string;
};

/**
 * Each metal episode of one pool with the evidence that points at a cause:
 * fill-water tests and shared-source alerts, an ageing copper exchanger with
 * corrosive water before onset, copper algaecide or an ioniser, iron with well
 * water. Evidence, not a verdict. Null when the pool is not in scope.
 */
export async function poolEvidence(
  scope: Scope,
  poolId: number,
  params: AnalyticsParams & { balanceBand: BalanceBand },
  formatDate?: (epochMs: number) => string,
): Promise<PoolEvidence | null> {
  if (!(await poolInScope(scope, poolId))) return null;
  // One version for the pool's episodes and its source's alerts, so the evidence never mixes two.
  const versionId = await keptVersionFor(scope.companyId, params);
  const [episodesRead, book, treated, balance] = await Promise.all([
    poolEpisodes(scope, poolId, params, "all", undefined, versionId),
    poolProfiles({ scope }, { poolIds: [poolId] }),
    // Algaecide evidence looks back before the window's first episode.
    treatmentRows({ scope }, { window: { from: null, to: params.window.to }, poolIds: [poolId] }),
    poolBalance(scope, poolId, { from: null, to: params.window.to }),
  ]);
  const pool = book.profiles[0]!;
  const sourceId = book.labels.get(poolId)?.fillSourceId ?? null;
  const [sourceTests, alerts] = await Promise.all([
    sourceId === null ? Promise.resolve([]) : sourceTestRows(scope.companyId, [sourceId]),
    sourceId === null
      ? Promise.resolve({ alerts: [] })
      : sharedSourceAlertList(
          scope,
          { ...params, window: { from: null, to: params.window.to }, metal: null, sourceIds: [sourceId] },
          versionId ?? undefined,
        ),
  ]);
  const fillSourceTests: FillSourceTest[] = sourceTests.map((t) => ({
    fillSourceId: String(t.fillSourceId),
    takenAt: dayToMs(t.sampledOn)!,
    copper: t.copper,
    iron: t.iron,
    manganese: t.manganese,
  }));
  const sharedSourceAlerts: SharedSourceAlert[] = alerts.alerts.map((a) => ({
    fillSourceId: String(a.fillSourceId),
    metal: a.metal,
    firstOpeningAt: Date.parse(a.firstOpeningAt),
    lastOpeningAt: Date.parse(a.lastOpeningAt),
    // The alert names only pools in scope; the count is what the reason uses.
    poolIds: Array.from({ length: a.poolCount }, (_, i) => String(a.pools[i]?.poolId ?? `other-${i}`)),
    activePools: a.activePools,
    poolsRequired: a.poolsRequired,
  }));
  const episodes = [...episodesRead.list]
    .sort((a, b) => b.openedAt - a.openedAt)
    .map((e) => ({
      ...episodeJson(e),
      evidence: likelySourceEvidence({
        pool,
        metal: e.metal,
        onsetAt: e.openedAt,
        fillSourceTests,
        sharedSourceAlerts,
        balance,
        treatments: treated,
        thresholds: params.thresholds,
        rules: { balanceBand: params.balanceBand },
        formatDate,
      }).map((ev) => ({ kind: ev.kind, reason: ev.reason, at: isoInstant(ev.at) })),
    }));
  return {
    poolId,
    episodes,
    openEpisodes: episodes.filter((e) => e.censored).length,
    source: episodesRead.source,
    note: "Evidence points at possible causes; more than one can be at work. It is not a verdict.",
  };
}

/**
 * The pool page's metal panel in one call: the company's levels and balance
 * band, the whole history, dates in the company's time zone.
 */
export async function poolMetalPanel(scope: Scope, poolId: number): Promise<PoolEvidence | null> {
  const settings = await companyPreferences(scope);
  return poolEvidence(
    scope,
    poolId,
    { window: ALL_TIME, thresholds: settings.thresholds, metal: null, balanceBand: settings.balanceBand },
    (ms) => formatDate(new Date(ms), scope.timeZone),
  );
}
