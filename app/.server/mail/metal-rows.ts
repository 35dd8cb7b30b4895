import { and, asc, eq, inArray, type SQL } from "drizzle-orm";
import type { MetalTest } from "@analysis/metals/episodes";
import type { MetalReading } from "@analysis/metals/reading";
import { db } from "../db/client";
import { waterTests } from "../db/schema";

function reading(value: number | null, belowDetection: boolean): MetalReading | null {
  return value === null ? null : { value, belowDetection };
}

/**
 * Metal readings of the given pools in the shape the analysis core reads,
 * ordered by pool and time (the order analyseMetalHistory uses as is).
 * Mail runs outside any member's request, so it reads by company, never wider.
 */
export async function metalTestsOfPools(companyId: number, poolIds: readonly number[], until?: SQL): Promise<MetalTest[]> {
  if (poolIds.length === 0) return [];
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
    })
    .from(waterTests)
    .where(and(eq(waterTests.companyId, companyId), inArray(waterTests.poolId, [...poolIds]), until))
    .orderBy(asc(waterTests.poolId), asc(waterTests.sampledAt));
  return rows.map((r) => ({
    id: String(r.id),
    poolId: String(r.poolId),
    takenAt: r.sampledAt.getTime(),
    copper: reading(r.copper, r.copperBelowDetection),
    iron: reading(r.iron, r.ironBelowDetection),
    manganese: reading(r.manganese, r.manganeseBelowDetection),
  }));
}
