import {
  DEFAULT_METAL_THRESHOLDS,
  METALS,
  metalStatus,
  type Metal,
  type MetalReading,
  type MetalThresholds,
} from "./reading";

export const DAY_MS = 86_400_000;

export type HardnessEndpoint = "clean" | "blurred";

/** The part of a water test that the metal history needs. Times are epoch milliseconds. */
export interface MetalTest {
  id: string;
  poolId: string;
  takenAt: number;
  copper?: MetalReading | null;
  iron?: MetalReading | null;
  manganese?: MetalReading | null;
  hardnessEndpoint?: HardnessEndpoint | null;
}

export interface Episode {
  poolId: string;
  metal: Metal;
  openedAt: number;
  openedByTestId: string;
  /** Null while the episode is still open at the end of the data (censored). */
  closedAt: number | null;
  closedByTestId: string | null;
  censored: boolean;
  /** Closing time, or the pool's last test for a censored episode. */
  endAt: number;
  durationDays: number;
  /** Highest measured value (not a detection limit) while open, mg/L. */
  peak: number;
  /** Tests of this pool from opening to close, both included. */
  testCount: number;
  chronic: boolean;
  /** This opening came within the recurrence window of the pool's previous opening of the metal. */
  recurrence: boolean;
}

export interface RecurrenceFinding {
  poolId: string;
  metal: Metal;
  openings: number;
  recurrent: boolean;
  /** The opening that first completed a pair inside the window. */
  firstRecurrenceAt: number | null;
}

/**
 * A blurred hardness endpoint with no metal reading on the same test hints at
 * metals; the hint stands until a metal reading is logged on the pool.
 */
export interface MetalSuspicion {
  poolId: string;
  raisedAt: number;
  raisedByTestId: string;
  resolvedAt: number | null;
  resolvedByTestId: string | null;
  blurredTests: number;
}

export interface PoolObservation {
  poolId: string;
  firstTestAt: number;
  lastTestAt: number;
  tests: number;
}

export interface MetalHistoryOptions {
  thresholds?: MetalThresholds;
  metals?: readonly Metal[];
  recurrenceWindowDays?: number;
  chronicAfterDays?: number;
}

export const DEFAULT_EPISODE_RULES = {
  recurrenceWindowDays: 365,
  chronicAfterDays: 60,
} as const;

export interface MetalHistory {
  episodes: Episode[];
  recurrence: RecurrenceFinding[];
  suspicions: MetalSuspicion[];
  pools: PoolObservation[];
}

/**
 * Visits the tests pool by pool in time order. Input already grouped by pool
 * and ordered by time (as a query with ORDER BY pool, time returns it) is used
 * as is; anything else is sorted once.
 */
function orderedByPoolAndTime(tests: readonly MetalTest[]): readonly MetalTest[] {
  const finishedPools = new Set<string>();
  let currentPool: string | null = null;
  let previousTime = -Infinity;
  for (const test of tests) {
    if (test.poolId !== currentPool) {
      if (currentPool !== null) finishedPools.add(currentPool);
      if (finishedPools.has(test.poolId)) return sortedCopy(tests);
      currentPool = test.poolId;
      previousTime = -Infinity;
    }
    if (test.takenAt < previousTime) return sortedCopy(tests);
    previousTime = test.takenAt;
  }
  return tests;
}

function sortedCopy(tests: readonly MetalTest[]): MetalTest[] {
  return [...tests].sort((a, b) =>
    a.poolId < b.poolId ? -1 : a.poolId > b.poolId ? 1 : a.takenAt - b.takenAt,
  );
}

interface OpenEpisode {
  openedAt: number;
  openedByTestId: string;
  peak: number;
  testCount: number;
  recurrence: boolean;
}

/**
 * Episodes, recurrence, chronic episodes and metal suspicions for every pool
 * in one linear pass (after at most one sort).
 *
 * An episode opens at the first test at or above "elevated" and closes at the
 * first later test below "clear"; "watch", "<x" above clear and untested
 * visits leave it as it is. That hysteresis keeps a level hovering at one
 * threshold from opening and closing an episode every week.
 */
export function analyseMetalHistory(tests: readonly MetalTest[], options: MetalHistoryOptions = {}): MetalHistory {
  const thresholds = options.thresholds ?? DEFAULT_METAL_THRESHOLDS;
  const metals = options.metals ?? METALS;
  const windowMs = (options.recurrenceWindowDays ?? DEFAULT_EPISODE_RULES.recurrenceWindowDays) * DAY_MS;
  const chronicMs = (options.chronicAfterDays ?? DEFAULT_EPISODE_RULES.chronicAfterDays) * DAY_MS;
  const ordered = orderedByPoolAndTime(tests);

  const episodes: Episode[] = [];
  const recurrence: RecurrenceFinding[] = [];
  const suspicions: MetalSuspicion[] = [];
  const pools: PoolObservation[] = [];

  const metalCount = metals.length;
  const open: Array<OpenEpisode | null> = new Array(metalCount).fill(null);
  const lastOpeningAt: number[] = new Array(metalCount).fill(-Infinity);
  const openings: number[] = new Array(metalCount).fill(0);
  const firstRecurrenceAt: Array<number | null> = new Array(metalCount).fill(null);

  let poolId: string | null = null;
  let firstTestAt = 0;
  let lastTestAt = 0;
  let poolTests = 0;
  let suspicion: MetalSuspicion | null = null;

  const finishEpisode = (m: number, ep: OpenEpisode, closedAt: number | null, closedBy: string | null) => {
    const endAt = closedAt ?? lastTestAt;
    const duration = endAt - ep.openedAt;
    episodes.push({
      poolId: poolId!,
      metal: metals[m]!,
      openedAt: ep.openedAt,
      openedByTestId: ep.openedByTestId,
      closedAt,
      closedByTestId: closedBy,
      censored: closedAt === null,
      endAt,
      durationDays: duration / DAY_MS,
      peak: ep.peak,
      testCount: ep.testCount,
      chronic: duration > chronicMs,
      recurrence: ep.recurrence,
    });
  };

  const finishPool = () => {
    if (poolId === null) return;
    for (let m = 0; m < metalCount; m++) {
      const ep = open[m];
      if (ep) finishEpisode(m, ep, null, null);
      if (openings[m]! > 0) {
        recurrence.push({
          poolId,
          metal: metals[m]!,
          openings: openings[m]!,
          recurrent: firstRecurrenceAt[m] !== null,
          firstRecurrenceAt: firstRecurrenceAt[m]!,
        });
      }
      open[m] = null;
      lastOpeningAt[m] = -Infinity;
      openings[m] = 0;
      firstRecurrenceAt[m] = null;
    }
    if (suspicion) suspicions.push(suspicion);
    suspicion = null;
    pools.push({ poolId, firstTestAt, lastTestAt, tests: poolTests });
  };

  for (const test of ordered) {
    if (test.poolId !== poolId) {
      finishPool();
      poolId = test.poolId;
      firstTestAt = test.takenAt;
      poolTests = 0;
    }
    lastTestAt = test.takenAt;
    poolTests++;

    let anyMetalRead = false;
    for (let m = 0; m < metalCount; m++) {
      const metal = metals[m]!;
      const reading = test[metal];
      const ep = open[m];
      if (ep) ep.testCount++;
      if (!reading) continue;
      anyMetalRead = true;
      const status = metalStatus(reading, thresholds[metal]);
      if (ep) {
        if (!reading.belowDetection && reading.value > ep.peak) ep.peak = reading.value;
        if (status === "clear") {
          finishEpisode(m, ep, test.takenAt, test.id);
          open[m] = null;
        }
      } else if (status === "elevated") {
        const recurs = test.takenAt - lastOpeningAt[m]! <= windowMs;
        if (recurs && firstRecurrenceAt[m] === null) firstRecurrenceAt[m] = test.takenAt;
        lastOpeningAt[m] = test.takenAt;
        openings[m]!++;
        open[m] = {
          openedAt: test.takenAt,
          openedByTestId: test.id,
          peak: reading.value,
          testCount: 1,
          recurrence: recurs,
        };
      }
    }

    // Any metal reading on the pool answers the hint, whatever the metal.
    const anyReading = anyMetalRead || METALS.some((metal) => test[metal]);
    if (suspicion && anyReading) {
      suspicion.resolvedAt = test.takenAt;
      suspicion.resolvedByTestId = test.id;
      suspicions.push(suspicion);
      suspicion = null;
    }
    if (test.hardnessEndpoint === "blurred" && !anyReading) {
      if (suspicion) suspicion.blurredTests++;
      else {
        suspicion = {
          poolId: test.poolId,
          raisedAt: test.takenAt,
          raisedByTestId: test.id,
          resolvedAt: null,
          resolvedByTestId: null,
          blurredTests: 1,
        };
      }
    }
  }
  finishPool();
  return { episodes, recurrence, suspicions, pools };
}

/** Open suspicions, i.e. pools where a metal test is due. */
export function openSuspicions(history: MetalHistory): MetalSuspicion[] {
  return history.suspicions.filter((s) => s.resolvedAt === null);
}
