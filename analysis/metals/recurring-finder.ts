import { analyseMetalHistory, type MetalHistory, type MetalTest } from "@analysis/metals/episodes";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { episodeJson, isoInstant, type EpisodeJson } from "../json-shapes";

export type RecurringPool = {
  poolId: number;
  street: string;
  customerName: string;
  routeName: string | null;
  fillSourceName: string | null;
  metals: Array<{ metal: Metal; openings: number; recurrent: boolean; chronic: boolean; firstRecurrenceAt: string | null }>;
  episodes: EpisodeJson[];
};

export type RecurringFindings = {
  rules: { recurrenceWindowDays: number; chronicAfterDays: number };
  recurringPools: number;
  chronicPools: number;
  pools: RecurringPool[];
};

export type PoolNames = { street: string; customerName: string; routeName: string | null; fillSourceName: string | null };

type RecurringOptions = { thresholds: MetalThresholds; metals: readonly Metal[]; recurrenceWindowDays: number; chronicAfterDays: number };

/** Recurring or chronic pools among already-read readings (also run in the browser). */
export function findRecurring(readings: readonly MetalTest[], labels: ReadonlyMap<number, PoolNames>, options: RecurringOptions): RecurringFindings {
  return recurringFromHistory(analyseMetalHistory(readings, options), labels, options);
}

/** Recurring or chronic pools of a metal history already worked out (or kept). */
export function recurringFromHistory(
  history: Pick<MetalHistory, "episodes" | "recurrence">,
  labels: ReadonlyMap<number, PoolNames>,
  options: Omit<RecurringOptions, "thresholds">,
): RecurringFindings {
  const episodesByPool = new Map<string, typeof history.episodes>();
  for (const e of history.episodes) episodesByPool.set(e.poolId, [...(episodesByPool.get(e.poolId) ?? []), e]);
  const result: RecurringPool[] = [];
  let recurringPools = 0;
  let chronicPools = 0;
  const findingsByPool = new Map<string, typeof history.recurrence>();
  for (const r of history.recurrence) findingsByPool.set(r.poolId, [...(findingsByPool.get(r.poolId) ?? []), r]);
  for (const [poolId, episodes] of episodesByPool) {
    const findings = findingsByPool.get(poolId) ?? [];
    const metals = options.metals
      .map((metal) => {
        const finding = findings.find((f) => f.metal === metal);
        const chronic = episodes.some((e) => e.metal === metal && e.chronic);
        return {
          metal,
          openings: finding?.openings ?? 0,
          recurrent: finding?.recurrent ?? false,
          chronic,
          firstRecurrenceAt: isoInstant(finding?.firstRecurrenceAt ?? null),
        };
      })
      .filter((m) => m.recurrent || m.chronic);
    if (metals.length === 0) continue;
    if (metals.some((m) => m.recurrent)) recurringPools++;
    if (metals.some((m) => m.chronic)) chronicPools++;
    const label = labels.get(Number(poolId));
    result.push({
      poolId: Number(poolId),
      street: label?.street ?? "",
      customerName: label?.customerName ?? "",
      routeName: label?.routeName ?? null,
      fillSourceName: label?.fillSourceName ?? null,
      metals,
      episodes: episodes.map(episodeJson),
    });
  }
  // Most openings first: the pools that cost the most visits.
  result.sort((a, b) => b.episodes.length - a.episodes.length || a.poolId - b.poolId);
  return {
    rules: { recurrenceWindowDays: options.recurrenceWindowDays, chronicAfterDays: options.chronicAfterDays },
    recurringPools,
    chronicPools,
    pools: result,
  };
}

