import { and, eq, inArray, type SQL, sql } from "drizzle-orm";
import type { Scope } from "../guard";
import { fillSources, pools } from "../db/schema";

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

/**
 * Fill sources a member may see: the company's, and for technicians only the
 * sources of their routes' pools (a private well is named after its address).
 */
export function sourcesInScope(scope: Scope): SQL {
  const company = eq(fillSources.companyId, scope.companyId);
  if (scope.routeIds === null) return company;
  return and(
    company,
    sql`EXISTS (SELECT 1 FROM ${pools} WHERE ${pools.fillSourceId} = ${fillSources.id} AND ${poolsInScope(scope)})`,
  )!;
}
