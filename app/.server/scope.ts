import { and, eq, inArray, type SQL, sql } from "drizzle-orm";
import type { RoleName } from "~/lib/roles";
import { fillSources, pools } from "./db/schema";

/**
 * What a signed-in member may see. Every query takes a Scope, so nothing can be
 * read without a company and, for technicians, without their routes. This
 * module knows nothing of sessions: the guard builds a Scope once per request.
 */
export type Scope = {
  userId: string;
  userName: string;
  email: string;
  companyId: number;
  companyName: string;
  timeZone: string;
  role: RoleName;
  /** null: every route of the company; otherwise the routes this member works. */
  routeIds: number[] | null;
};

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

/** Pools in the member's scope that are still served (not archived). */
export function activePoolsInScope(scope: Scope): SQL {
  return and(poolsInScope(scope), eq(pools.active, true))!;
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
