// What was known about each pool and metal at a given instant, as numbers a
// model can weigh. Every feature at time t reads only data from before t, so
// the same rows serve the fit, the backtest and today's list.
import { classifyBalance, type BalanceBand } from "../chemistry/saturation";
import { analyseMetalHistory, DAY_MS, type Episode, type MetalTest } from "../metals/episodes";
import type { Metal, MetalReading, MetalThresholds } from "../metals/reading";
import { isInstalledAt, type PoolProfile } from "../metals/route-book";

export const HORIZON_DAYS = 28;
const YEAR_MS = 365.25 * DAY_MS;

export const FEATURES = [
  "latestReading",
  "readingRise",
  "pastEpisodes",
  "recentEpisode",
  "fillWater",
  "sourceWave",
  "corrosiveWater",
  "exchangerAge",
  "exchangerInCorrosiveWater",
  "seasonSin",
  "seasonCos",
  "copperAlgaecide",
] as const;
export type FeatureName = (typeof FEATURES)[number];

/** A saturation index worked out for one test of a pool. */
export interface BalancePoint {
  poolId: string;
  takenAt: number;
  index: number;
}

export interface FillWaterTest {
  fillSourceId: string;
  takenAt: number;
  copper: MetalReading | null;
  iron: MetalReading | null;
  manganese: MetalReading | null;
}

export interface AheadHistory {
  /** The instant the history runs to: horizons ending later have no outcome yet. */
  asOf: number;
  /** Every water test of the company (metals unmeasured are null), as analyseMetalHistory reads them. */
  tests: readonly MetalTest[];
  /** Saturation indices of the tests that carried the balance inputs. */
  balance: readonly BalancePoint[];
  /** Copper algaecide doses (pool and time). */
  copperAlgaecide: readonly { poolId: string; appliedAt: number }[];
  fillWaterTests: readonly FillWaterTest[];
  pools: readonly PoolProfile[];
  thresholds: MetalThresholds;
  balanceBand: BalanceBand;
}

/** The raw facts behind a row's features, for putting a reason into words. */
export interface RowFacts {
  latestValue: number | null;
  latestAt: number | null;
  previousValue: number | null;
  openings: number;
  lastClosedAt: number | null;
  fillWaterValue: number | null;
  fillWaterAt: number | null;
  waveOpenings: number;
  corrosiveShare: number | null;
  exchanger: { metal: "copper" | "cupronickel"; ageYears: number } | null;
  algaecideDoses: number;
}

export interface FeatureRow {
  poolId: string;
  metal: Metal;
  at: number;
  values: number[];
  facts: RowFacts;
  /** An episode of the metal was open at `at`: nothing can open, so the row is left out. */
  episodeOpen: boolean;
  /**
   * 1 when an episode of the metal opened within the horizon after `at`, 0 when
   * none did; null when the horizon is not over yet or the pool left the book during it.
   */
  outcome: number | null;
}

function lastAtOrBefore<T>(sorted: readonly T[], at: number, time: (item: T) => number): number {
  let low = 0;
  let high = sorted.length - 1;
  let found = -1;
  while (low <= high) {
    const mid = (low + high) >> 1;
    if (time(sorted[mid]!) <= at) {
      found = mid;
      low = mid + 1;
    } else high = mid - 1;
  }
  return found;
}

function groupBy<T>(items: readonly T[], key: (item: T) => string, time: (item: T) => number): Map<string, T[]> {
  const map = new Map<string, T[]>();
  for (const item of items) {
    const list = map.get(key(item));
    if (list) list.push(item);
    else map.set(key(item), [item]);
  }
  for (const list of map.values()) list.sort((a, b) => time(a) - time(b));
  return map;
}

/** Everything the rows need, indexed once: readings, episodes and fill-water tests by pool, source and metal. */
export interface PreparedHistory {
  history: AheadHistory;
  metals: readonly Metal[];
  episodes: Episode[];
  readingsByPoolMetal: Map<string, { at: number; value: number }[]>;
  episodesByPoolMetal: Map<string, Episode[]>;
  openingsBySourceMetal: Map<string, { at: number; poolId: string }[]>;
  balanceByPool: Map<string, BalancePoint[]>;
  algaecideByPool: Map<string, number[]>;
  fillWaterBySource: Map<string, FillWaterTest[]>;
  poolsById: Map<string, PoolProfile>;
  testTimesByPool: Map<string, number[]>;
}

const poolMetal = (poolId: string, metal: Metal) => `${poolId}:${metal}`;

export function prepareHistory(history: AheadHistory, metals: readonly Metal[]): PreparedHistory {
  const analysed = analyseMetalHistory(history.tests, { thresholds: history.thresholds, metals });
  const readingsByPoolMetal = new Map<string, { at: number; value: number }[]>();
  for (const test of history.tests) {
    for (const metal of metals) {
      const reading = test[metal];
      if (!reading) continue;
      const key = poolMetal(test.poolId, metal);
      // A "<x" reading says the metal was below detection: counted as none.
      const value = reading.belowDetection ? 0 : reading.value;
      const list = readingsByPoolMetal.get(key);
      if (list) list.push({ at: test.takenAt, value });
      else readingsByPoolMetal.set(key, [{ at: test.takenAt, value }]);
    }
  }
  for (const list of readingsByPoolMetal.values()) list.sort((a, b) => a.at - b.at);
  const poolsById = new Map(history.pools.map((p) => [p.poolId, p]));
  const sourceOf = (poolId: string) => poolsById.get(poolId)?.fillSourceId ?? null;
  const openings: { sourceMetal: string; at: number; poolId: string }[] = [];
  for (const e of analysed.episodes) {
    const source = sourceOf(e.poolId);
    if (source !== null) openings.push({ sourceMetal: `${source}:${e.metal}`, at: e.openedAt, poolId: e.poolId });
  }
  return {
    history,
    metals,
    episodes: analysed.episodes,
    readingsByPoolMetal,
    episodesByPoolMetal: groupBy(analysed.episodes, (e) => poolMetal(e.poolId, e.metal), (e) => e.openedAt),
    openingsBySourceMetal: groupBy(openings, (o) => o.sourceMetal, (o) => o.at) as Map<string, { at: number; poolId: string }[]>,
    balanceByPool: groupBy(history.balance, (b) => b.poolId, (b) => b.takenAt),
    algaecideByPool: new Map(
      [...groupBy(history.copperAlgaecide, (a) => a.poolId, (a) => a.appliedAt)].map(([k, v]) => [k, v.map((a) => a.appliedAt)]),
    ),
    fillWaterBySource: groupBy(history.fillWaterTests, (t) => t.fillSourceId, (t) => t.takenAt),
    poolsById,
    testTimesByPool: new Map(
      [...groupBy(history.tests, (t) => t.poolId, (t) => t.takenAt)].map(([k, v]) => [k, v.map((t) => t.takenAt)]),
    ),
  };
}

const CORROSIVE_LOOKBACK_MS = 60 * DAY_MS;
const WAVE_LOOKBACK_MS = HORIZON_DAYS * DAY_MS;
const FILL_WATER_LOOKBACK_MS = 2 * YEAR_MS;
/** A pool counts as on the book at t when tested within this long before t. */
const ACTIVE_WITHIN_MS = 35 * DAY_MS;

/** Copper or cupronickel heat exchangers in place at t: the oldest one's alloy and age. */
function copperExchangerAt(pool: PoolProfile | undefined, at: number): RowFacts["exchanger"] {
  let oldest: RowFacts["exchanger"] = null;
  for (const item of pool?.equipment ?? []) {
    if (item.exchangerMetal !== "copper" && item.exchangerMetal !== "cupronickel") continue;
    if (item.kind !== "heater" && item.kind !== "heat-pump") continue;
    if (!isInstalledAt(item, at)) continue;
    // An undated exchanger counts as new: its age is unknown, and guessing it old would invent a reason.
    const ageYears = item.installedAt === null ? 0 : (at - item.installedAt) / YEAR_MS;
    if (!oldest || ageYears > oldest.ageYears) oldest = { metal: item.exchangerMetal, ageYears };
  }
  return oldest;
}

/**
 * The feature row of one pool and metal at instant t, from data at or before t
 * only; null when the pool was not on the book at t (no test in the 35 days before).
 */
export function featureRow(prepared: PreparedHistory, poolId: string, metal: Metal, at: number): FeatureRow | null {
  const { history } = prepared;
  const testTimes = prepared.testTimesByPool.get(poolId) ?? [];
  const t = lastAtOrBefore(testTimes, at, (x) => x);
  if (t < 0 || at - testTimes[t]! > ACTIVE_WITHIN_MS) return null;
  const last = testTimes[testTimes.length - 1]!;
  const pool = prepared.poolsById.get(poolId);
  const elevated = history.thresholds[metal].elevated;

  const readings = prepared.readingsByPoolMetal.get(poolMetal(poolId, metal)) ?? [];
  const r = lastAtOrBefore(readings, at, (x) => x.at);
  const latest = r >= 0 ? readings[r]! : null;
  const previous = r >= 1 ? readings[r - 1]! : null;

  const episodes = prepared.episodesByPoolMetal.get(poolMetal(poolId, metal)) ?? [];
  const e = lastAtOrBefore(episodes, at, (x) => x.openedAt);
  const openings = e + 1;
  const lastEpisode = e >= 0 ? episodes[e]! : null;
  const episodeOpen = lastEpisode !== null && (lastEpisode.closedAt === null || lastEpisode.closedAt > at);
  let lastClosedAt: number | null = null;
  for (let i = e; i >= 0; i--) {
    const closedAt = episodes[i]!.closedAt;
    if (closedAt !== null && closedAt <= at) {
      lastClosedAt = closedAt;
      break;
    }
  }
  const next = episodes[e + 1];
  const horizonEnd = at + HORIZON_DAYS * DAY_MS;
  // A pool that left the book during the horizon (no test in its last week) has no outcome to learn from.
  const outcomeKnown = horizonEnd <= history.asOf && last >= horizonEnd - 7 * DAY_MS;
  const outcome = next !== undefined && next.openedAt <= horizonEnd ? 1 : 0;

  const sourceId = pool?.fillSourceId ?? null;
  let fillWaterValue: number | null = null;
  let fillWaterAt: number | null = null;
  let waveOpenings = 0;
  if (sourceId !== null) {
    const fills = prepared.fillWaterBySource.get(sourceId) ?? [];
    for (let i = lastAtOrBefore(fills, at, (x) => x.takenAt); i >= 0; i--) {
      const test = fills[i]!;
      if (at - test.takenAt > FILL_WATER_LOOKBACK_MS) break;
      const reading = test[metal];
      if (!reading) continue;
      fillWaterValue = reading.belowDetection ? 0 : reading.value;
      fillWaterAt = test.takenAt;
      break;
    }
    const wave = prepared.openingsBySourceMetal.get(`${sourceId}:${metal}`) ?? [];
    for (let i = lastAtOrBefore(wave, at, (x) => x.at); i >= 0 && at - wave[i]!.at <= WAVE_LOOKBACK_MS; i--) {
      if (wave[i]!.poolId !== poolId) waveOpenings++;
    }
  }

  const balance = prepared.balanceByPool.get(poolId) ?? [];
  let corrosive = 0;
  let balanceCount = 0;
  for (let i = lastAtOrBefore(balance, at, (x) => x.takenAt); i >= 0 && balanceCount < 4; i--) {
    if (at - balance[i]!.takenAt > CORROSIVE_LOOKBACK_MS) break;
    balanceCount++;
    if (classifyBalance(balance[i]!.index, history.balanceBand) === "corrosive") corrosive++;
  }
  const corrosiveShare = balanceCount === 0 ? null : corrosive / balanceCount;

  const copperOnly = metal === "copper";
  const exchanger = copperOnly ? copperExchangerAt(pool, at) : null;
  const doses = copperOnly ? (prepared.algaecideByPool.get(poolId) ?? []) : [];
  let algaecideDoses = 0;
  for (let i = lastAtOrBefore(doses, at, (x) => x); i >= 0 && at - doses[i]! <= WAVE_LOOKBACK_MS; i--) algaecideDoses++;

  // The middle of the horizon decides the season the row looks into.
  const middle = new Date(at + (HORIZON_DAYS / 2) * DAY_MS);
  const yearStart = Date.UTC(middle.getUTCFullYear(), 0, 1);
  const angle = (2 * Math.PI * (middle.getTime() - yearStart)) / YEAR_MS;

  const ratio = (value: number | null) => (value === null ? 0 : Math.min(3, value / elevated));
  const exchangerAge = exchanger ? Math.min(25, exchanger.ageYears) / 10 : 0;
  const values: Record<FeatureName, number> = {
    latestReading: ratio(latest?.value ?? null),
    readingRise: latest && previous ? Math.max(-2, Math.min(2, (latest.value - previous.value) / elevated)) : 0,
    pastEpisodes: Math.log1p(openings),
    recentEpisode: lastClosedAt === null ? 0 : Math.exp(-(at - lastClosedAt) / (90 * DAY_MS)),
    fillWater: Math.min(5, fillWaterValue === null ? 0 : fillWaterValue / elevated),
    sourceWave: Math.log1p(waveOpenings),
    corrosiveWater: corrosiveShare ?? 0,
    exchangerAge,
    exchangerInCorrosiveWater: exchangerAge * (corrosiveShare ?? 0),
    seasonSin: Math.sin(angle),
    seasonCos: Math.cos(angle),
    copperAlgaecide: Math.min(4, algaecideDoses),
  };
  return {
    poolId,
    metal,
    at,
    values: FEATURES.map((f) => values[f]),
    facts: {
      latestValue: latest?.value ?? null,
      latestAt: latest?.at ?? null,
      previousValue: previous?.value ?? null,
      openings,
      lastClosedAt,
      fillWaterValue,
      fillWaterAt,
      waveOpenings,
      corrosiveShare,
      exchanger,
      algaecideDoses,
    },
    episodeOpen,
    outcome: outcomeKnown ? outcome : null,
  };
}
