import type { Metal } from "@analysis/metals/reading";
import type { PoolProfile } from "@analysis/metals/route-book";
import {
  CHANGES_OVER_TIME,
  GROUPING_KEYS,
  groupComparisonFinder,
  riskyGroupFinder,
  type GroupingKey,
  type GroupStatistics,
  type ObservedInstants,
} from "@analysis/stats/groups";
import { groupValueLabel } from "~/lib/analytics/labels";
import { observationInstants } from "~/lib/analytics/observation-points";
import type { Scope } from "../../scope";
import { jsonInterval, type JsonInterval } from "@analysis/json-shapes";
import type { AnswerSource } from "../kept/read-kept";
import { loadMetalDataset, type MetalDataset } from "./metal-dataset";
import type { AnalyticsParams } from "./tenant-and-window";

export type GroupFiguresParams = AnalyticsParams & { grouping: GroupingKey };

export type GroupFigure = {
  group: string;
  label: string;
  pools: number;
  poolsWithEpisode: number;
  poolYears: number;
  openings: number;
  /** Episode openings per pool-year, exact Poisson 95% interval. */
  ratePerPoolYear: JsonInterval;
  /** Share of the group's pools with any opening, Wilson 95% interval. */
  shareWithEpisode: JsonInterval;
  /** Against the rest of the route book in scope; conditional exact 95% interval (upper null = unbounded). */
  rateRatio: JsonInterval;
  risky: boolean;
  tooSmallToJudge: boolean;
};

export type GroupFigures = { grouping: GroupingKey; metal: Metal | null; pools: number; poolYears: number; openings: number; groups: GroupFigure[] };

/** Names for source and route ids, so groups read as people know them. */
function groupNames(dataset: MetalDataset, grouping: GroupingKey): Map<string, string> {
  const names = new Map<string, string>();
  for (const label of dataset.book.labels.values()) {
    if (grouping === "fill-source" && label.fillSourceId !== null && label.fillSourceName)
      names.set(String(label.fillSourceId), label.fillSourceName);
    if (grouping === "route" && label.routeId !== null && label.routeName) names.set(String(label.routeId), label.routeName);
  }
  return names;
}

/**
 * Each pool's observed instants for this dimension. A pool's observed time
 * runs from its first to its last test in the window; for heater age and
 * exchanger metal it is split at the dates the answer can change.
 */
function observedInstants(
  dataset: MetalDataset,
  grouping: GroupingKey,
  profiles: ReadonlyMap<string, PoolProfile> = new Map(dataset.book.profiles.map((p) => [p.poolId, p])),
): ObservedInstants[] {
  const observed: ObservedInstants[] = [];
  for (const span of dataset.spans) {
    const pool = profiles.get(span.poolId);
    if (pool) observed.push({ poolId: span.poolId, instants: observationInstants(pool, span.firstAt, span.lastAt, grouping) });
  }
  return observed;
}

/**
 * A dimension's groups compared with the rest of the route book, for one metal
 * or all: the same figures as comparing the pools' observations (the analysis
 * core's groupObservations and compareGroups), worked out from cells.
 */
export function computeGroupFigures(dataset: MetalDataset, grouping: GroupingKey, metal: Metal | null): GroupFigures {
  const compare = groupComparisonFinder(dataset.book.profiles, dataset.history.episodes, [metal], undefined, "every");
  const comparison = compare(grouping, observedInstants(dataset, grouping)).get(metal)!;
  const names = groupNames(dataset, grouping);
  return {
    grouping,
    metal,
    pools: comparison.pools,
    poolYears: comparison.poolYears,
    openings: comparison.openings,
    groups: comparison.groups.map((s) => figureOf(grouping, s, names)),
  };
}

export async function groupFigures(scope: Scope, params: GroupFiguresParams): Promise<GroupFigures & { source: AnswerSource }> {
  const dataset = await loadMetalDataset(scope, params);
  return { ...computeGroupFigures(dataset, params.grouping, params.metal), source: dataset.source };
}

export type RiskyGroup = GroupFigure & { grouping: GroupingKey; metal: Metal };

/** A group's figures as the API gives them, named as people know the group. */
function figureOf(grouping: GroupingKey, s: GroupStatistics, names: ReadonlyMap<string, string>): GroupFigure {
  return {
    group: s.group,
    label: groupValueLabel(grouping, s.group, names),
    pools: s.pools,
    poolsWithEpisode: s.poolsWithEpisode,
    poolYears: s.poolYears,
    openings: s.openings,
    ratePerPoolYear: jsonInterval(s.rate),
    shareWithEpisode: jsonInterval(s.shareWithEpisode),
    rateRatio: jsonInterval(s.rateRatio),
    risky: s.risky,
    tooSmallToJudge: s.tooSmallToJudge,
  };
}

/** Every group flagged risky, over all dimensions and each metal of the dataset. */
export function computeRiskyGroups(dataset: MetalDataset): RiskyGroup[] {
  const risky: RiskyGroup[] = [];
  const riskyIn = riskyGroupFinder(dataset.book.profiles, dataset.history.episodes, dataset.metals);
  const profiles = new Map(dataset.book.profiles.map((p) => [p.poolId, p]));
  // Dimensions fixed over time share one set of instants (each span's ends); the others split spans at their own dates.
  let fixedInstants: ObservedInstants[] | undefined;
  for (const grouping of GROUPING_KEYS) {
    const names = groupNames(dataset, grouping);
    const observed = CHANGES_OVER_TIME.has(grouping)
      ? observedInstants(dataset, grouping, profiles)
      : (fixedInstants ??= observedInstants(dataset, grouping, profiles));
    // The observed time does not depend on the metal: it is split into groups once per dimension.
    const byMetal = riskyIn(grouping, observed);
    for (const metal of dataset.metals) {
      for (const g of byMetal.get(metal)!) risky.push({ ...figureOf(grouping, g, names), grouping, metal });
    }
  }
  // Metal first, then dimension, as listed before the sort, so groups of equal ratio keep one order.
  const order = (g: RiskyGroup) => dataset.metals.indexOf(g.metal) * GROUPING_KEYS.length + GROUPING_KEYS.indexOf(g.grouping);
  return risky.sort((a, b) => order(a) - order(b)).sort((a, b) => (b.rateRatio.estimate ?? Infinity) - (a.rateRatio.estimate ?? Infinity));
}
