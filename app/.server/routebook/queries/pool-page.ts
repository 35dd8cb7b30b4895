import { and, asc, desc, eq } from "drizzle-orm";
import { analyseMetalHistory, openSuspicions, type MetalTest } from "@analysis/metals/episodes";
import { db } from "../../db/client";
import { equipment, products, treatments, user, waterTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { metalReading } from "../../analytics/queries/metal-readings";
import { poolWithPlace } from "./pool-detail";

const HISTORY_LIMIT = 250;

/**
 * Everything the pool page shows, or null when the pool is outside the
 * member's scope. Tests come newest first.
 */
export async function poolPage(scope: Scope, poolId: number) {
  const row = await poolWithPlace(scope, poolId);
  if (!row) return null;
  const [items, tests, given] = await Promise.all([
    db()
      .select()
      .from(equipment)
      .where(and(eq(equipment.companyId, scope.companyId), eq(equipment.poolId, poolId)))
      .orderBy(asc(equipment.removedOn), desc(equipment.installedOn)),
    db()
      .select({ test: waterTests, technicianName: user.name })
      .from(waterTests)
      .leftJoin(user, eq(user.id, waterTests.technicianId))
      .where(and(eq(waterTests.companyId, scope.companyId), eq(waterTests.poolId, poolId)))
      .orderBy(desc(waterTests.sampledAt))
      .limit(HISTORY_LIMIT),
    db()
      .select({
        id: treatments.id,
        appliedAt: treatments.appliedAt,
        amount: treatments.amount,
        unit: treatments.unit,
        cost: treatments.cost,
        productName: products.name,
        category: products.category,
        appliedByName: user.name,
      })
      .from(treatments)
      .innerJoin(products, eq(products.id, treatments.productId))
      .leftJoin(user, eq(user.id, treatments.appliedBy))
      .where(and(eq(treatments.companyId, scope.companyId), eq(treatments.poolId, poolId)))
      .orderBy(desc(treatments.appliedAt))
      .limit(HISTORY_LIMIT),
  ]);

  const history: MetalTest[] = tests
    .map(({ test }) => ({
      id: String(test.id),
      poolId: String(poolId),
      takenAt: test.sampledAt.getTime(),
      copper: metalReading(test.copper, test.copperBelowDetection),
      iron: metalReading(test.iron, test.ironBelowDetection),
      manganese: metalReading(test.manganese, test.manganeseBelowDetection),
      hardnessEndpoint: test.hardnessEndpoint,
    }))
    .reverse();
  const [suspicion] = openSuspicions(analyseMetalHistory(history));

  return {
    ...row,
    equipment: items,
    tests: tests.map(({ test, technicianName }) => ({ ...test, technicianName })),
    treatments: given,
    metalSuspectedSince: suspicion ? new Date(suspicion.raisedAt) : null,
  };
}

