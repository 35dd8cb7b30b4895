import type { Episode, MetalTest } from "../metals/episodes";
import type { Metal } from "../metals/reading";
import { DEFAULT_HEATER_AGE_EDGES, exchangerMetalAt, heaterAgeBucketAt, type PoolProfile } from "../metals/route-book";
import { DEFAULT_CONFIDENCE, poissonRateInterval, rateRatioInterval, wilsonInterval, type Interval, type RateRatio } from "./intervals";

export type GroupingKey = "fill-source" | "fill-source-kind" | "heater-age" | "exchanger-metal" | "neighbourhood" | "route" | "surface" | "sanitiser";

export const GROUPING_KEYS: readonly GroupingKey[] = [
  "fill-source",
  "fill-source-kind",
  "heater-age",
  "exchanger-metal",
  "neighbourhood",
  "route",
  "surface",
  "sanitiser",
];

export const UNKNOWN_GROUP = "unknown";

export const MS_PER_YEAR = 365.25 * 86_400_000;

/** One pool's time and episode openings inside one group. */
export interface GroupObservation {
  group: string;
  poolId: string;
  years: number;
  openings: number;
}

export interface GroupRules {
  /** Groups with fewer pools are shown but marked too small to judge. */
  minPools: number;
  /** Risky when the rate ratio's lower bound is above this. */
  riskyRatioLowerBound: number;
  level: number;
  heaterAgeEdges: readonly number[];
}

export const DEFAULT_GROUP_RULES: GroupRules = {
  minPools: 3,
  riskyRatioLowerBound: 1,
  level: DEFAULT_CONFIDENCE,
  heaterAgeEdges: DEFAULT_HEATER_AGE_EDGES,
};

export function groupOf(pool: PoolProfile, key: GroupingKey, at: number, rules: Pick<GroupRules, "heaterAgeEdges"> = DEFAULT_GROUP_RULES): string {
  switch (key) {
    case "fill-source":
      return pool.fillSourceId ?? UNKNOWN_GROUP;
    case "fill-source-kind":
      return pool.fillSourceKind ?? UNKNOWN_GROUP;
    case "heater-age":
      return heaterAgeBucketAt(pool, at, rules.heaterAgeEdges);
    case "exchanger-metal":
      return exchangerMetalAt(pool, at);
    case "neighbourhood":
      return pool.neighbourhood ?? UNKNOWN_GROUP;
    case "route":
      return pool.routeId ?? UNKNOWN_GROUP;
    case "surface":
      return pool.surface ?? UNKNOWN_GROUP;
    case "sanitiser":
      return pool.sanitiser ?? UNKNOWN_GROUP;
  }
}

export interface ObservationOptions {
  metal?: Metal;
  rules?: Partial<GroupRules>;
}

/**
 * Splits each pool's observed time (first to last test) into groups. Keys that
 * change over time, such as heater age, are read at each test, and the time up
 * to the next test is credited to that group, so equipment age is always the
 * age at the date of a test. An opening belongs to the group at its own test.
 */
export function groupObservations(
  pools: readonly PoolProfile[],
  tests: readonly Pick<MetalTest, "poolId" | "takenAt">[],
  episodes: readonly Episode[],
  key: GroupingKey,
  options: ObservationOptions = {},
): GroupObservation[] {
  return groupObservationsByMetal(pools, tests, episodes, key, [options.metal ?? null], options.rules).get(options.metal ?? null)!;
}

/**
 * The same observations for several metals at once (null: every metal): the
 * observed years, the costly part, are split into groups once, and each
 * metal's openings counted on its own copy of them.
 */
export function groupObservationsByMetal<M extends Metal | null>(
  pools: readonly PoolProfile[],
  tests: readonly Pick<MetalTest, "poolId" | "takenAt">[],
  episodes: readonly Episode[],
  key: GroupingKey,
  metals: readonly M[],
  rulesOverride?: Partial<GroupRules>,
): Map<M, GroupObservation[]> {
  const rules = { ...DEFAULT_GROUP_RULES, ...rulesOverride };
  const profiles = new Map(pools.map((p) => [p.poolId, p]));
  // Cells by pool, then by group, as indices into one list: a pool has one or a few groups, so no
  // joined keys are built for tens of thousands of cells.
  const cells: GroupObservation[] = [];
  const cellsOfPool = new Map<string, Map<string, number>>();
  const cellIndex = (group: string, poolId: string): number => {
    let groups = cellsOfPool.get(poolId);
    if (!groups) cellsOfPool.set(poolId, (groups = new Map()));
    let index = groups.get(group);
    if (index === undefined) {
      index = cells.push({ group, poolId, years: 0, openings: 0 }) - 1;
      groups.set(group, index);
    }
    return index;
  };

  const timesByPool = new Map<string, number[]>();
  for (const test of tests) {
    if (!profiles.has(test.poolId)) continue;
    const list = timesByPool.get(test.poolId);
    if (list) list.push(test.takenAt);
    else timesByPool.set(test.poolId, [test.takenAt]);
  }
  for (const [poolId, times] of timesByPool) {
    const pool = profiles.get(poolId)!;
    times.sort((a, b) => a - b);
    for (let i = 0; i + 1 < times.length; i++) {
      const at = times[i]!;
      cells[cellIndex(groupOf(pool, key, at, rules), poolId)]!.years += (times[i + 1]! - at) / MS_PER_YEAR;
    }
    if (times.length === 1) cellIndex(groupOf(pool, key, times[0]!, rules), poolId);
  }
  const observedCells = cells.length;
  // An episode opens in the group its pool was in at that moment: worked out once, whichever metals are asked.
  // A pool observed outside that group still gets a cell for the opening (no years of its own).
  const openedIn: Array<{ metal: Metal; cell: number }> = [];
  for (const episode of episodes) {
    const pool = profiles.get(episode.poolId);
    if (!pool) continue;
    openedIn.push({ metal: episode.metal, cell: cellIndex(groupOf(pool, key, episode.openedAt, rules), episode.poolId) });
  }
  const byMetal = new Map<M, GroupObservation[]>();
  for (const metal of metals) {
    const openings = new Int32Array(cells.length);
    for (const o of openedIn) if (metal === null || o.metal === metal) openings[o.cell]!++;
    const list: GroupObservation[] = [];
    for (let i = 0; i < cells.length; i++) if (i < observedCells || openings[i]! > 0) list.push({ ...cells[i]!, openings: openings[i]! });
    byMetal.set(metal, list);
  }
  return byMetal;
}

export interface GroupStatistics {
  group: string;
  pools: number;
  poolsWithEpisode: number;
  poolYears: number;
  openings: number;
  /** Episode openings per pool-year, exact Poisson interval. */
  rate: Interval;
  /** Share of the group's pools with any episode opening, Wilson interval. */
  shareWithEpisode: Interval;
  /** This group's rate over the rest of the route book's. */
  rateRatio: RateRatio;
  risky: boolean;
  tooSmallToJudge: boolean;
}

export function compareGroups(observations: readonly GroupObservation[], rulesOverride: Partial<GroupRules> = {}): GroupStatistics[] {
  return groupStatistics(observations, { ...DEFAULT_GROUP_RULES, ...rulesOverride }, false);
}

/**
 * Only the groups compareGroups would flag risky, with the same figures.
 * A group's interval is worked out only when its point estimate is above the
 * bound (the lower bound never is when the estimate is not), which spares
 * the exact intervals of most of a thousand fill sources.
 */
export function riskyGroups(observations: readonly GroupObservation[], rulesOverride: Partial<GroupRules> = {}): GroupStatistics[] {
  return groupStatistics(observations, { ...DEFAULT_GROUP_RULES, ...rulesOverride }, true).filter((g) => g.risky);
}

/** A group's pools, observed years and openings, summed over its observations. */
interface GroupTotals {
  group: string;
  pools: number;
  poolsWithEpisode: number;
  years: number;
  openings: number;
}

function groupStatistics(observations: readonly GroupObservation[], rules: GroupRules, riskyOnly: boolean): GroupStatistics[] {
  const totals = { years: 0, openings: 0 };
  const groups = new Map<string, { pools: Set<string>; poolsWithEpisode: Set<string>; years: number; openings: number }>();
  for (const o of observations) {
    totals.years += o.years;
    totals.openings += o.openings;
    let g = groups.get(o.group);
    if (!g) {
      g = { pools: new Set(), poolsWithEpisode: new Set(), years: 0, openings: 0 };
      groups.set(o.group, g);
    }
    g.pools.add(o.poolId);
    if (o.openings > 0) g.poolsWithEpisode.add(o.poolId);
    g.years += o.years;
    g.openings += o.openings;
  }
  const summed = [...groups].map(([group, g]) => ({ group, pools: g.pools.size, poolsWithEpisode: g.poolsWithEpisode.size, years: g.years, openings: g.openings }));
  return judgeGroups(summed, totals, rules, riskyOnly);
}

function judgeGroups(groups: readonly GroupTotals[], totals: { years: number; openings: number }, rules: GroupRules, riskyOnly: boolean): GroupStatistics[] {
  const result: GroupStatistics[] = [];
  for (const g of groups) {
    const tooSmallToJudge = g.pools < rules.minPools;
    if (riskyOnly) {
      const estimate = g.openings / g.years / ((totals.openings - g.openings) / (totals.years - g.years));
      if (tooSmallToJudge || (Number.isFinite(estimate) && estimate <= rules.riskyRatioLowerBound)) continue;
    }
    const rateRatio = rateRatioInterval(g.openings, g.years, totals.openings - g.openings, totals.years - g.years, rules.level);
    result.push({
      group: g.group,
      pools: g.pools,
      poolsWithEpisode: g.poolsWithEpisode,
      poolYears: g.years,
      openings: g.openings,
      rate: poissonRateInterval(g.openings, g.years, rules.level),
      shareWithEpisode: wilsonInterval(g.poolsWithEpisode, g.pools, rules.level),
      rateRatio,
      risky: !tooSmallToJudge && rateRatio.lower > rules.riskyRatioLowerBound,
      tooSmallToJudge,
    });
  }
  return result.sort((a, b) => (a.group < b.group ? -1 : a.group > b.group ? 1 : 0));
}

/** Dimensions whose group can change during a pool's observed time (with its equipment). */
export const CHANGES_OVER_TIME: ReadonlySet<GroupingKey> = new Set(["heater-age", "exchanger-metal"]);

/** A pool's observed time as instants (its first and last test, and any moment its group can change between). */
export type ObservedInstants = { poolId: string; instants: readonly number[] };

/**
 * The groups riskyGroups would flag for each metal, from the same pools,
 * instants and episodes as groupObservationsByMetal, with every figure the
 * same to the last digit: years and openings are summed cell by cell in the
 * same order, but a cell is a few numbers, not an object per pool and metal.
 */
export function riskyGroupsByMetal<M extends Metal | null>(
  pools: readonly PoolProfile[],
  observed: readonly ObservedInstants[],
  episodes: readonly Episode[],
  key: GroupingKey,
  metals: readonly M[],
  rulesOverride?: Partial<GroupRules>,
): Map<M, GroupStatistics[]> {
  return riskyGroupFinder(pools, episodes, metals, rulesOverride)(key, observed);
}

/**
 * riskyGroupsByMetal for several dimensions of one route book: the pools and
 * episodes are indexed once, then each dimension costs a pass over the pools'
 * instants and the episodes.
 */
export function riskyGroupFinder<M extends Metal | null>(
  pools: readonly PoolProfile[],
  episodes: readonly Episode[],
  metals: readonly M[],
  rulesOverride?: Partial<GroupRules>,
): (key: GroupingKey, observed: readonly ObservedInstants[]) => Map<M, GroupStatistics[]> {
  const find = groupComparisonFinder(pools, episodes, metals, rulesOverride, "risky");
  return (key, observed) => new Map([...find(key, observed)].map(([metal, comparison]) => [metal, comparison.groups]));
}

/** Every group of one dimension compared with the rest, and what they were compared over. */
export interface GroupComparison {
  groups: GroupStatistics[];
  /** Pools observed or with an opening. */
  pools: number;
  poolYears: number;
  openings: number;
}

/**
 * compareGroups (or riskyGroups) of each metal's observations, from the same
 * pools, instants and episodes as groupObservationsByMetal, with every figure
 * the same to the last digit: years and openings are summed cell by cell in
 * the same order, but a cell is a few numbers, not an object per pool and metal.
 */
export function groupComparisonFinder<M extends Metal | null>(
  pools: readonly PoolProfile[],
  episodes: readonly Episode[],
  metals: readonly M[],
  rulesOverride: Partial<GroupRules> | undefined,
  which: "every" | "risky",
): (key: GroupingKey, observed: readonly ObservedInstants[]) => Map<M, GroupComparison> {
  const rules = { ...DEFAULT_GROUP_RULES, ...rulesOverride };
  const poolIndex = new Map<string, number>();
  pools.forEach((p, i) => poolIndex.set(p.poolId, i));
  const episodePool = Int32Array.from(episodes, (e) => poolIndex.get(e.poolId) ?? -1);
  // Bit m set: the episode counts as an opening for metals[m].
  const episodeMetals = Int32Array.from(episodes, (e) => metals.reduce((bits, metal, m) => (metal === null || metal === e.metal ? bits | (1 << m) : bits), 0));

  const timesOf = (instants: readonly number[]) => {
    for (let i = 1; i < instants.length; i++) if (instants[i]! < instants[i - 1]!) return [...instants].sort((x, y) => x - y);
    return instants;
  };

  /** Each metal's groups from cells: a cell is one pool's time (years) and openings in one group. */
  const judgeCells = (
    groupNames: readonly string[],
    cellGroup: ArrayLike<number>,
    cellPool: ArrayLike<number>,
    cellYears: ArrayLike<number>,
    observedCells: number,
    openedOf: (m: number) => ArrayLike<number>,
  ) => {
    const byMetal = new Map<M, GroupComparison>();
    const seen = new Int32Array(pools.length).fill(-1);
    metals.forEach((metal, m) => {
      const opened = openedOf(m);
      const groups: GroupTotals[] = groupNames.map((group) => ({ group, pools: 0, poolsWithEpisode: 0, years: 0, openings: 0 }));
      const totals = { years: 0, openings: 0 };
      let poolsCounted = 0;
      for (let c = 0; c < cellGroup.length; c++) {
        if (c >= observedCells && opened[c] === 0) continue;
        const g = groups[cellGroup[c]!]!;
        totals.years += cellYears[c]!;
        totals.openings += opened[c]!;
        if (seen[cellPool[c]!] !== m) {
          seen[cellPool[c]!] = m;
          poolsCounted++;
        }
        g.pools++;
        if (opened[c]! > 0) g.poolsWithEpisode++;
        g.years += cellYears[c]!;
        g.openings += opened[c]!;
      }
      const present = groups.filter((g) => g.pools > 0);
      const judged = judgeGroups(present, totals, rules, which === "risky");
      byMetal.set(metal, {
        groups: which === "risky" ? judged.filter((g) => g.risky) : judged,
        pools: poolsCounted,
        poolYears: totals.years,
        openings: totals.openings,
      });
    });
    return byMetal;
  };

  // A dimension fixed over time puts each pool in one cell whatever the moment, so the pools' years and
  // openings are summed once (per list of instants) and each such dimension only puts the cells in groups.
  let fixedCells: { observed: readonly ObservedInstants[]; pool: number[]; at: number[]; years: number[]; observedCells: number; opened: Int32Array[] } | undefined;
  const cellsOfFixedDimension = (observed: readonly ObservedInstants[]) => {
    if (fixedCells?.observed === observed) return fixedCells;
    const cellOfPool = new Int32Array(pools.length).fill(-1);
    const pool: number[] = [];
    const at: number[] = [];
    const years: number[] = [];
    for (const { poolId, instants } of observed) {
      const p = poolIndex.get(poolId);
      if (p === undefined || instants.length === 0 || cellOfPool[p] !== -1) continue;
      const times = timesOf(instants);
      let spent = 0;
      for (let i = 0; i + 1 < times.length; i++) spent += (times[i + 1]! - times[i]!) / MS_PER_YEAR;
      cellOfPool[p] = pool.push(p) - 1;
      at.push(times[0]!);
      years.push(spent);
    }
    const observedCells = pool.length;
    const episodeCell = new Int32Array(episodes.length);
    episodes.forEach((episode, e) => {
      const p = episodePool[e]!;
      if (p >= 0 && cellOfPool[p] === -1) {
        cellOfPool[p] = pool.push(p) - 1;
        at.push(episode.openedAt);
        years.push(0);
      }
      episodeCell[e] = p >= 0 ? cellOfPool[p]! : -1;
    });
    const opened = metals.map((_, m) => {
      const counts = new Int32Array(pool.length);
      for (let e = 0; e < episodes.length; e++) if (episodeCell[e]! >= 0 && episodeMetals[e]! & (1 << m)) counts[episodeCell[e]!]!++;
      return counts;
    });
    return (fixedCells = { observed, pool, at, years, observedCells, opened });
  };

  return (key, observed) => {
    const changes = CHANGES_OVER_TIME.has(key);
    const groupIndex = new Map<string, number>();
    const groupNames: string[] = [];
    const groupAt = (pool: PoolProfile, at: number) => {
      const group = groupOf(pool, key, at, rules);
      let index = groupIndex.get(group);
      if (index === undefined) groupIndex.set(group, (index = groupNames.push(group) - 1));
      return index;
    };
    if (!changes) {
      const cells = cellsOfFixedDimension(observed);
      const cellGroup = cells.pool.map((p, c) => groupAt(pools[p]!, cells.at[c]!));
      return judgeCells(groupNames, cellGroup, cells.pool, cells.years, cells.observedCells, (m) => cells.opened[m]!);
    }
    // A cell is one pool's time in one group. A pool's observed cells are consecutive: [first, end).
    const cellGroup: number[] = [];
    const cellPool: number[] = [];
    const cellYears: number[] = [];
    const firstCell = new Int32Array(pools.length).fill(-1);
    const endCell = new Int32Array(pools.length);
    for (const { poolId, instants } of observed) {
      const p = poolIndex.get(poolId);
      if (p === undefined || instants.length === 0 || firstCell[p] !== -1) continue;
      const pool = pools[p]!;
      const times = timesOf(instants);
      const first = cellGroup.length;
      // Time up to the next instant goes to the group at the earlier one; a lone instant gives a cell without years.
      const steps = times.length === 1 ? 1 : times.length - 1;
      for (let i = 0; i < steps; i++) {
        const group = groupAt(pool, times[i]!);
        let cell = first;
        while (cell < cellGroup.length && cellGroup[cell] !== group) cell++;
        if (cell === cellGroup.length) {
          cellGroup.push(group);
          cellPool.push(p);
          cellYears.push(0);
        }
        if (times.length > 1) cellYears[cell]! += (times[i + 1]! - times[i]!) / MS_PER_YEAR;
      }
      firstCell[p] = first;
      endCell[p] = cellGroup.length;
    }
    const observedCells = cellGroup.length;
    // An opening outside the pool's observed groups gets a cell of its own, without years.
    const openingCells = new Map<string, number>();
    const episodeCell = new Int32Array(episodes.length).fill(-1);
    episodes.forEach((episode, e) => {
      const p = episodePool[e]!;
      if (p < 0) return;
      const group = groupAt(pools[p]!, episode.openedAt);
      let cell = -1;
      for (let c = firstCell[p]!; c >= 0 && c < endCell[p]! && cell < 0; c++) if (cellGroup[c] === group) cell = c;
      if (cell < 0) {
        const name = `${p}:${group}`;
        cell = openingCells.get(name) ?? -1;
        if (cell < 0) {
          cellYears.push(0);
          cellPool.push(p);
          openingCells.set(name, (cell = cellGroup.push(group) - 1));
        }
      }
      episodeCell[e] = cell;
    });
    return judgeCells(groupNames, cellGroup, cellPool, cellYears, observedCells, (m) => {
      const opened = new Int32Array(cellGroup.length);
      for (let e = 0; e < episodes.length; e++) if (episodeCell[e]! >= 0 && episodeMetals[e]! & (1 << m)) opened[episodeCell[e]!]!++;
      return opened;
    });
  };
}

/** Observations and comparison in one call, for one grouping key. */
export function groupComparison(...input: Parameters<typeof groupObservations>): GroupStatistics[] {
  const options = input[4];
  return compareGroups(groupObservations(...input), options?.rules);
}
