import type { Episode } from "@analysis/metals/episodes";
import type { Metal } from "@analysis/metals/reading";
import type { Interval } from "@analysis/stats/intervals";

/** JSON has no NaN or Infinity: an undefined estimate or an unbounded side becomes null. */
export type JsonInterval = { estimate: number | null; lower: number | null; upper: number | null };

export function jsonInterval(interval: Interval): JsonInterval {
  const finite = (n: number) => (Number.isFinite(n) ? n : null);
  return { estimate: finite(interval.estimate), lower: finite(interval.lower), upper: finite(interval.upper) };
}

export const isoInstant = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString());

export type EpisodeJson = {
  metal: Metal;
  openedAt: string;
  closedAt: string | null;
  /** Still open at the pool's last test in the window: not closed, only unobserved further. */
  censored: boolean;
  endAt: string;
  durationDays: number;
  peak: number;
  testCount: number;
  chronic: boolean;
  recurrence: boolean;
};

export function episodeJson(e: Episode): EpisodeJson {
  return {
    metal: e.metal,
    openedAt: isoInstant(e.openedAt)!,
    closedAt: isoInstant(e.closedAt),
    censored: e.censored,
    endAt: isoInstant(e.endAt)!,
    durationDays: e.durationDays,
    peak: e.peak,
    testCount: e.testCount,
    chronic: e.chronic,
    recurrence: e.recurrence,
  };
}
