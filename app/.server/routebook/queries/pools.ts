import { and, asc, desc, eq, like, or, sql } from "drizzle-orm";
import { likePattern, type ListParams } from "~/lib/list-params";
import type { SURFACES } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { utcDate } from "../../db/values";
import { equipment, fillSources, pools, routes } from "../../db/schema";
import { activePoolsInScope, type Scope, poolsInScope } from "../../scope";
import { listPage } from "./list-page";

export const POOL_SORTS = ["account", "customer", "street", "neighbourhood", "route", "volume", "lastTest"] as const;
export type PoolSort = (typeof POOL_SORTS)[number];
export const POOL_STATUSES = ["active", "archived", "all"] as const;

export type PoolFilters = {
  routeId: number | null;
  fillSourceId: number | null;
  surface: (typeof SURFACES)[number] | null;
  status: (typeof POOL_STATUSES)[number];
};

export async function listPools(scope: Scope, params: ListParams<PoolSort>, filters: PoolFilters) {
  const pattern = params.q ? likePattern(params.q) : null;
  const lastTest = sql<string | null>`(SELECT MAX(w.sampled_at) FROM water_tests w WHERE w.pool_id = ${pools.id})`;
  const where = and(
    poolsInScope(scope),
    pattern
      ? or(
          like(pools.accountCode, pattern),
          like(pools.customerName, pattern),
          like(pools.street, pattern),
          like(pools.neighbourhood, pattern),
          like(pools.postalCode, pattern),
        )
      : undefined,
    filters.routeId ? eq(pools.routeId, filters.routeId) : undefined,
    filters.fillSourceId ? eq(pools.fillSourceId, filters.fillSourceId) : undefined,
    filters.surface ? eq(pools.surface, filters.surface) : undefined,
    filters.status === "all" ? undefined : eq(pools.active, filters.status === "active"),
  );
  const sorts = {
    account: pools.accountCode,
    customer: pools.customerName,
    street: pools.street,
    neighbourhood: pools.neighbourhood,
    route: routes.name,
    volume: pools.volumeLitres,
    lastTest,
  };
  const select = db()
    .select({
      id: pools.id,
      accountCode: pools.accountCode,
      customerName: pools.customerName,
      street: pools.street,
      neighbourhood: pools.neighbourhood,
      routeName: routes.name,
      fillSourceName: fillSources.name,
      volumeLitres: pools.volumeLitres,
      surface: pools.surface,
      active: pools.active,
      lastTest,
    })
    .from(pools)
    .leftJoin(routes, eq(routes.id, pools.routeId))
    .leftJoin(fillSources, eq(fillSources.id, pools.fillSourceId));
  const { rows, total } = await listPage(select, { table: pools, where, sorts, params });
  return { rows: rows.map((r) => ({ ...r, lastTest: utcDate(r.lastTest) })), total };
}

export async function poolForEdit(scope: Scope, poolId: number) {
  const [pool] = await db()
    .select()
    .from(pools)
    .where(and(poolsInScope(scope), eq(pools.id, poolId)));
  if (!pool) return null;
  const items = await db()
    .select()
    .from(equipment)
    .where(and(eq(equipment.companyId, scope.companyId), eq(equipment.poolId, poolId)))
    .orderBy(asc(equipment.removedOn), desc(equipment.installedOn), desc(equipment.id));
  return { pool, equipment: items };
}

/** A pool as the visit picker and the day's stops name it (pools joined with their route). */
export const poolStopColumns = {
  poolId: pools.id,
  customerName: pools.customerName,
  street: pools.street,
  neighbourhood: pools.neighbourhood,
  routeName: routes.name,
};

/** Pools matching a search, for the visit picker. */
export async function searchPools(scope: Scope, q: string, limit = 20) {
  const pattern = likePattern(q);
  return db()
    .select({ ...poolStopColumns, accountCode: pools.accountCode })
    .from(pools)
    .leftJoin(routes, eq(routes.id, pools.routeId))
    .where(
      and(
        activePoolsInScope(scope),
        or(like(pools.accountCode, pattern), like(pools.customerName, pattern), like(pools.street, pattern)),
      ),
    )
    .orderBy(asc(pools.street))
    .limit(limit);
}
