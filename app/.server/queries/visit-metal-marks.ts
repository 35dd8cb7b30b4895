import { and, asc, eq, inArray, isNotNull, or } from "drizzle-orm";
import { analyseMetalHistory, openSuspicions, type MetalTest } from "@analysis/metals/episodes";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { db } from "../db/client";
import { pools, waterTests } from "../db/schema";
import type { Scope } from "../guard";
import { poolsInScope } from "./scope";

/** Why a technician should bring the metal test kit to a pool. */
export type MetalMark = {
  /** A blurred hardness endpoint with no metal reading since. */
  suspected: boolean;
  /** Metals whose case is open: last elevated, not yet read clear. */
  openMetals: Metal[];
};

const reading = (value: number | null, belowDetection: boolean) => (value === null ? null : { value, belowDetection });

/**
 * Metal marks for the listed pools (in the member's scope), keyed by pool id;
 * pools with nothing to bring the kit for are left out. Only tests carrying a
 * metal reading or a blurred endpoint can open or close a case or a
 * suspicion, so only those are read.
 */
export async function metalMarks(scope: Scope, poolIds: readonly number[], thresholds: MetalThresholds): Promise<Record<number, MetalMark>> {
  if (poolIds.length === 0) return {};
  const rows = await db()
    .select({
      id: waterTests.id,
      poolId: waterTests.poolId,
      sampledAt: waterTests.sampledAt,
      copper: waterTests.copper,
      copperBelowDetection: waterTests.copperBelowDetection,
      iron: waterTests.iron,
      ironBelowDetection: waterTests.ironBelowDetection,
      manganese: waterTests.manganese,
      manganeseBelowDetection: waterTests.manganeseBelowDetection,
      hardnessEndpoint: waterTests.hardnessEndpoint,
    })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(
      and(
        poolsInScope(scope),
        eq(waterTests.companyId, scope.companyId),
        inArray(waterTests.poolId, [...poolIds]),
        or(
          isNotNull(waterTests.copper),
          isNotNull(waterTests.iron),
          isNotNull(waterTests.manganese),
          eq(waterTests.hardnessEndpoint, "blurred"),
        ),
      ),
    )
    .orderBy(asc(waterTests.poolId), asc(waterTests.sampledAt));

  const tests: MetalTest[] = rows.map((r) => ({
    id: String(r.id),
    poolId: String(r.poolId),
    takenAt: r.sampledAt.getTime(),
    copper: reading(r.copper, r.copperBelowDetection),
    iron: reading(r.iron, r.ironBelowDetection),
    manganese: reading(r.manganese, r.manganeseBelowDetection),
    hardnessEndpoint: r.hardnessEndpoint,
  }));
  const history = analyseMetalHistory(tests, { thresholds });

  const marks: Record<number, MetalMark> = {};
  const markOf = (poolId: string) => (marks[Number(poolId)] ??= { suspected: false, openMetals: [] });
  for (const suspicion of openSuspicions(history)) markOf(suspicion.poolId).suspected = true;
  for (const episode of history.episodes) {
    if (episode.censored) markOf(episode.poolId).openMetals.push(episode.metal);
  }
  return marks;
}
