import { TZDate } from "@date-fns/tz";
import { and, eq, gte, inArray, lte, type SQL } from "drizzle-orm";
import type { Metal, MetalThresholds } from "@analysis/metals/reading";
import { db } from "../../db/client";
import { inIdList } from "../../db/id-list";
import { type equipment, type keptEpisodes, type keptPoolSpans, type keptTreatmentCourses, pools, type treatments, waterTests } from "../../db/schema";
import { type Scope, poolsInScope } from "../../scope";

/**
 * Whose rows are read: a member's Scope (company and, for technicians, their
 * routes' pools), or a whole company for mail sent outside any request.
 */
export type Tenant = { scope: Scope } | { companyId: number };

/** Instants bounding the rows read; null = open-ended. */
export type TimeWindow = { from: Date | null; to: Date | null };

export const ALL_TIME: TimeWindow = { from: null, to: null };

/** The typed parameters every analytics question takes besides the Scope. */
export type AnalyticsParams = {
  window: TimeWindow;
  thresholds: MetalThresholds;
  /** null: every metal. */
  metal: Metal | null;
};

export const companyOf = (tenant: Tenant): number => ("scope" in tenant ? tenant.scope.companyId : tenant.companyId);

type CompanyColumn = typeof waterTests.companyId | typeof treatments.companyId | typeof pools.companyId;

/**
 * The tenant condition of a read: the row's company and, with a Scope, the
 * member's pools (the caller joins `pools`).
 */
export function tenantCondition(tenant: Tenant, companyColumn: CompanyColumn = pools.companyId): SQL {
  if (!("scope" in tenant)) return eq(companyColumn, tenant.companyId);
  if (companyColumn === pools.companyId) return poolsInScope(tenant.scope);
  return and(poolsInScope(tenant.scope), eq(companyColumn, tenant.scope.companyId))!;
}

type TableOfPoolRows = typeof keptEpisodes | typeof keptPoolSpans | typeof keptTreatmentCourses | typeof equipment;

/**
 * The tenant's rows of a table of pool rows, by the row's own company and,
 * for a member limited to some routes, their pools (a subquery). No join to
 * `pools`: on a company-wide read it cost one pool lookup per row, tens of
 * thousands of them on a large company.
 */
export function rowsOfTenantPools(tenant: Tenant, table: TableOfPoolRows, poolIds?: readonly number[]) {
  const limitedTo = "scope" in tenant && tenant.scope.routeIds !== null ? tenant.scope : null;
  return and(
    eq(table.companyId, companyOf(tenant)),
    limitedTo ? inArray(table.poolId, db().select({ id: pools.id }).from(pools).where(poolsInScope(limitedTo))) : undefined,
    poolIds ? inIdList(table.poolId, poolIds) : undefined,
  );
}

/** The window condition on a time column; undefined when the window is open at both ends. */
export function withinWindow(column: typeof waterTests.sampledAt | typeof treatments.appliedAt, window: TimeWindow | undefined): SQL | undefined {
  return and(window?.from ? gte(column, window.from) : undefined, window?.to ? lte(column, window.to) : undefined);
}

/** The same window test for an instant already read (epoch milliseconds). */
export function isWithin(at: number, window: TimeWindow): boolean {
  return (!window.from || at >= window.from.getTime()) && (!window.to || at <= window.to.getTime());
}

/** Water tests of the tenant in the window (the caller joins `pools`). */
export function testsInScope(tenant: Tenant, window: TimeWindow | undefined): SQL {
  return and(tenantCondition(tenant, waterTests.companyId), withinWindow(waterTests.sampledAt, window))!;
}

/** Whole local days in the company's time zone: from its first instant to the end of `to`. */
export function resolveWindow(scope: Scope, days: { from?: string; to?: string }): TimeWindow {
  const startOf = (text: string) => {
    const [y, m, d] = text.split("-").map(Number) as [number, number, number];
    return new Date(new TZDate(y, m - 1, d, scope.timeZone).getTime());
  };
  return {
    from: days.from ? startOf(days.from) : null,
    to: days.to ? new Date(startOf(days.to).getTime() + 86_400_000 - 1) : null,
  };
}

/**
 * A member's scope narrowed to one route. A route outside the member's
 * routes (or company) leaves nothing in scope, so it reveals nothing.
 */
export function narrowToRoute(scope: Scope, routeId: number | undefined): Scope {
  if (routeId === undefined) return scope;
  if (scope.routeIds !== null && !scope.routeIds.includes(routeId)) return { ...scope, routeIds: [] };
  return { ...scope, routeIds: [routeId] };
}
