import { eq, or } from "drizzle-orm";
import { analyseMetalHistory, openSuspicions } from "@analysis/metals/episodes";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { anyMetalMeasured, waterTestReadings } from "../../analytics/queries/metal-readings";

/** Why a technician should bring the metal test kit to a pool. */
export type MetalMark = {
  /** A blurred hardness endpoint with no metal reading since. */
  suspected: boolean;
  /** Metals whose case is open: last elevated, not yet read clear. */
  openMetals: Metal[];
};

/**
 * Metal marks for the listed pools (in the member's scope), keyed by pool id;
 * pools with nothing to bring the kit for are left out. Only tests carrying a
 * metal reading or a blurred endpoint can open or close a case or a
 * suspicion, so only those are read.
 */
export async function metalMarks(scope: Scope, poolIds: readonly number[], thresholds: MetalThresholds): Promise<Record<number, MetalMark>> {
  if (poolIds.length === 0) return {};
  const tests = await waterTestReadings(
    { scope },
    { poolIds, with: { hardnessEndpoint: true }, where: or(anyMetalMeasured(), eq(waterTests.hardnessEndpoint, "blurred")) },
  );
  const history = analyseMetalHistory(tests, { thresholds });

  const marks: Record<number, MetalMark> = {};
  const markOf = (poolId: string) => (marks[Number(poolId)] ??= { suspected: false, openMetals: [] });
  for (const suspicion of openSuspicions(history)) markOf(suspicion.poolId).suspected = true;
  for (const episode of history.episodes) {
    if (episode.censored) markOf(episode.poolId).openMetals.push(episode.metal);
  }
  return marks;
}
