import { and, desc, eq } from "drizzle-orm";
import { db } from "../../db/client";
import { pools, routes, waterTests } from "../../db/schema";
import { type Scope, poolsInScope } from "../../scope";

/** The pool a visit is logged for, with its latest test for context; null outside the member's scope. */
export async function visitPool(scope: Scope, poolId: number) {
  const [pool] = await db()
    .select({
      id: pools.id,
      accountCode: pools.accountCode,
      customerName: pools.customerName,
      street: pools.street,
      volumeLitres: pools.volumeLitres,
      routeName: routes.name,
    })
    .from(pools)
    .leftJoin(routes, eq(routes.id, pools.routeId))
    .where(and(poolsInScope(scope), eq(pools.id, poolId)));
  if (!pool) return null;
  const [last] = await db()
    .select({ sampledAt: waterTests.sampledAt, ph: waterTests.ph, freeChlorine: waterTests.freeChlorine })
    .from(waterTests)
    .where(and(eq(waterTests.companyId, scope.companyId), eq(waterTests.poolId, poolId)))
    .orderBy(desc(waterTests.sampledAt))
    .limit(1);
  return { pool, lastTest: last ?? null };
}
