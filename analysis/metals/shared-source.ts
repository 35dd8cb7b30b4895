import { DAY_MS, type Episode } from "./episodes";
import type { Metal } from "./reading";
import type { PoolProfile } from "./route-book";

export interface SharedSourceRules {
  minPools: number;
  /** Share of the source's active pools that must open an episode. */
  minShareOfActivePools: number;
  windowDays: number;
}

/** Common practice defaults; every company can change them. */
export const DEFAULT_SHARED_SOURCE_RULES: SharedSourceRules = {
  minPools: 3,
  minShareOfActivePools: 0.25,
  windowDays: 21,
};

export interface SharedSourceAlert {
  fillSourceId: string;
  metal: Metal;
  firstOpeningAt: number;
  lastOpeningAt: number;
  poolIds: string[];
  activePools: number;
  /** Pools needed for an alert on this source: the larger of the two rules. */
  poolsRequired: number;
}

/**
 * Clusters of episode openings of one metal on pools that share a fill
 * source. Overlapping qualifying windows merge into one alert, so a wave of
 * openings is reported once rather than once per extra pool.
 *
 * activePools gives the number of active pools per source; without it, the
 * pools listed on the source count as active.
 */
export function sharedSourceAlerts(
  episodes: readonly Episode[],
  pools: ReadonlyArray<Pick<PoolProfile, "poolId" | "fillSourceId">>,
  options: { rules?: Partial<SharedSourceRules>; activePools?: ReadonlyMap<string, number> } = {},
): SharedSourceAlert[] {
  const rules = { ...DEFAULT_SHARED_SOURCE_RULES, ...options.rules };
  const windowMs = rules.windowDays * DAY_MS;
  const sourceOf = new Map<string, string>();
  const listedPools = new Map<string, number>();
  for (const pool of pools) {
    if (!pool.fillSourceId) continue;
    sourceOf.set(pool.poolId, pool.fillSourceId);
    listedPools.set(pool.fillSourceId, (listedPools.get(pool.fillSourceId) ?? 0) + 1);
  }

  const openingsBySourceMetal = new Map<string, Array<{ at: number; poolId: string }>>();
  for (const e of episodes) {
    const source = sourceOf.get(e.poolId);
    if (!source) continue;
    const key = `${source}\u0000${e.metal}`;
    const list = openingsBySourceMetal.get(key);
    const item = { at: e.openedAt, poolId: e.poolId };
    if (list) list.push(item);
    else openingsBySourceMetal.set(key, [item]);
  }

  const alerts: SharedSourceAlert[] = [];
  for (const [key, openings] of openingsBySourceMetal) {
    const [fillSourceId, metal] = key.split("\u0000") as [string, Metal];
    const activePools = options.activePools?.get(fillSourceId) ?? listedPools.get(fillSourceId) ?? 0;
    const poolsRequired = Math.max(rules.minPools, Math.ceil(rules.minShareOfActivePools * activePools));
    openings.sort((a, b) => a.at - b.at);
    const inWindow = new Map<string, number>();
    let left = 0;
    let current: { first: number; last: number; pools: Set<string> } | null = null;
    const flush = () => {
      if (!current) return;
      alerts.push({
        fillSourceId,
        metal,
        firstOpeningAt: current.first,
        lastOpeningAt: current.last,
        poolIds: [...current.pools].sort(),
        activePools,
        poolsRequired,
      });
      current = null;
    };
    for (let right = 0; right < openings.length; right++) {
      const entering = openings[right]!;
      inWindow.set(entering.poolId, (inWindow.get(entering.poolId) ?? 0) + 1);
      while (entering.at - openings[left]!.at > windowMs) {
        const leaving = openings[left]!.poolId;
        const count = inWindow.get(leaving)! - 1;
        if (count === 0) inWindow.delete(leaving);
        else inWindow.set(leaving, count);
        left++;
      }
      if (inWindow.size < poolsRequired) continue;
      const windowStart = openings[left]!.at;
      const active = current as { first: number; last: number; pools: Set<string> } | null;
      if (active && windowStart <= active.last) {
        active.last = entering.at;
        for (const poolId of inWindow.keys()) active.pools.add(poolId);
      } else {
        flush();
        current = { first: windowStart, last: entering.at, pools: new Set(inWindow.keys()) };
      }
    }
    flush();
  }
  return alerts.sort((a, b) => a.firstOpeningAt - b.firstOpeningAt);
}
