import { and, asc, desc, eq } from "drizzle-orm";
import { db } from "../../db/client";
import { equipment, fillSources, pools, routes, waterTests } from "../../db/schema";
import { type Scope, poolsInScope } from "../../scope";

/** One pool with its route's and fill source's names, or null outside the member's scope. */
export async function poolWithPlace(scope: Scope, poolId: number) {
  const [row] = await db()
    .select({ pool: pools, routeName: routes.name, fillSourceName: fillSources.name, fillSourceKind: fillSources.kind })
    .from(pools)
    .leftJoin(routes, eq(routes.id, pools.routeId))
    .leftJoin(fillSources, eq(fillSources.id, pools.fillSourceId))
    .where(and(poolsInScope(scope), eq(pools.id, poolId)));
  return row ?? null;
}

/**
 * One pool with its route, fill source, equipment and latest tests, or null
 * when the pool is not in the member's scope (another company, or another
 * technician's route).
 */
export async function poolDetail(scope: Scope, poolId: number, testLimit = 12) {
  const row = await poolWithPlace(scope, poolId);
  if (!row) return null;
  const [installed, tests] = await Promise.all([
    db()
      .select()
      .from(equipment)
      .where(and(eq(equipment.companyId, scope.companyId), eq(equipment.poolId, poolId)))
      .orderBy(asc(equipment.installedOn)),
    db()
      .select()
      .from(waterTests)
      .where(and(eq(waterTests.companyId, scope.companyId), eq(waterTests.poolId, poolId)))
      .orderBy(desc(waterTests.sampledAt))
      .limit(testLimit),
  ]);
  return { ...row, equipment: installed, tests };
}

