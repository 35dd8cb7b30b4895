import { and, eq, inArray, type SQL, sql } from "drizzle-orm";
import type { Scope } from "../guard";
import { pools } from "../db/schema";

/**
 * The condition every pool-level read carries: the member's company and, for
 * technicians, only their routes' pools.
 */
export function poolsInScope(scope: Scope): SQL {
  const company = eq(pools.companyId, scope.companyId);
  if (scope.routeIds === null) return company;
  if (scope.routeIds.length === 0) return and(company, sql`false`)!;
  return and(company, inArray(pools.routeId, scope.routeIds))!;
}
