import { and, asc, eq, inArray, like, type SQL, sql } from "drizzle-orm";
import { likePattern, type ListParams } from "~/lib/list-params";
import { db } from "../../db/client";
import { memberships, pools, routes, routeTechnicians, user } from "../../db/schema";
import type { Scope } from "../../scope";
import { listPage, nameOptions } from "./list-page";

export const ROUTE_SORTS = ["name", "weekdays", "pools"] as const;
export type RouteSort = (typeof ROUTE_SORTS)[number];

/** Routes the member may read: all of the company's, or a technician's own. */
function routesInScope(scope: Scope): SQL {
  const company = eq(routes.companyId, scope.companyId);
  if (scope.routeIds === null) return company;
  if (scope.routeIds.length === 0) return and(company, sql`false`)!;
  return and(company, inArray(routes.id, scope.routeIds))!;
}

export type RouteFilters = {
  /** null: in use and archived. */
  active: boolean | null;
};

export async function listRoutes(scope: Scope, params: ListParams<RouteSort>, filters: RouteFilters = { active: true }) {
  const poolCount = sql<number>`(SELECT COUNT(*) FROM ${pools} p WHERE p.route_id = ${routes.id} AND p.active = 1)`.mapWith(Number);
  const technicians = sql<string | null>`(SELECT GROUP_CONCAT(u.name ORDER BY u.name SEPARATOR ', ')
    FROM ${routeTechnicians} rt JOIN ${user} u ON u.id = rt.user_id WHERE rt.route_id = ${routes.id})`;
  const where = and(
    routesInScope(scope),
    params.q ? like(routes.name, likePattern(params.q)) : undefined,
    filters.active === null ? undefined : eq(routes.active, filters.active),
  );
  const sorts = { name: routes.name, weekdays: routes.serviceWeekdays, pools: poolCount };
  const select = db()
    .select({ id: routes.id, name: routes.name, serviceWeekdays: routes.serviceWeekdays, active: routes.active, technicians, poolCount })
    .from(routes);
  return listPage(select, { table: routes, where, sorts, params });
}

export async function routeForEdit(scope: Scope, routeId: number) {
  const [route] = await db()
    .select()
    .from(routes)
    .where(and(eq(routes.companyId, scope.companyId), eq(routes.id, routeId)));
  if (!route) return null;
  const assigned = await db()
    .select({ userId: routeTechnicians.userId })
    .from(routeTechnicians)
    .where(eq(routeTechnicians.routeId, routeId));
  return { ...route, technicianIds: assigned.map((a) => a.userId) };
}

/** Members with the technician role, who can be put on a route. */
export async function companyTechnicians(scope: Scope) {
  return db()
    .select({ userId: user.id, name: user.name })
    .from(memberships)
    .innerJoin(user, eq(user.id, memberships.userId))
    .where(and(eq(memberships.companyId, scope.companyId), eq(memberships.role, "technician")))
    .orderBy(asc(user.name));
}

/** Route names for pickers and filters, in the member's scope. */
export async function routeOptions(scope: Scope) {
  return nameOptions(routes, routesInScope(scope));
}
