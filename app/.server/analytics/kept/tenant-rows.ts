import { and, eq, inArray } from "drizzle-orm";
import { db } from "../../db/client";
import { inIdList } from "../../db/id-list";
import { pools, type keptEpisodes, type keptPoolSpans, type keptTreatmentCourses } from "../../db/schema";
import { poolsInScope } from "../../scope";
import { companyOf, type Tenant } from "../queries/tenant-and-window";

type KeptTableOfPools = typeof keptEpisodes | typeof keptPoolSpans | typeof keptTreatmentCourses;

/**
 * Tenant rows of a kept table, by the row's own company and, for a member
 * limited to some routes, their pools (a subquery). No join to `pools`: on a
 * company-wide read it cost one pool lookup per kept row, tens of thousands
 * of them on a large company.
 */
export function keptRowsOfTenant(tenant: Tenant, table: KeptTableOfPools, poolIds?: readonly number[]) {
  const limitedTo = "scope" in tenant && tenant.scope.routeIds !== null ? tenant.scope : null;
  return and(
    eq(table.companyId, companyOf(tenant)),
    limitedTo ? inArray(table.poolId, db().select({ id: pools.id }).from(pools).where(poolsInScope(limitedTo))) : undefined,
    poolIds ? inIdList(table.poolId, poolIds) : undefined,
  );
}
