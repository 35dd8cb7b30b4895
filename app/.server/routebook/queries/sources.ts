import { and, asc, desc, eq, like, sql } from "drizzle-orm";
import { likePattern, type ListParams } from "~/lib/list-params";
import type { SOURCE_KINDS } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { fillSources, pools, routes, sourceTests } from "../../db/schema";
import { type Scope, poolsInScope, sourcesInScope } from "../../scope";
import { listPage, nameOptions } from "./list-page";

export const SOURCE_SORTS = ["name", "kind", "pools", "lastTest"] as const;
export type SourceSort = (typeof SOURCE_SORTS)[number];

export async function listSources(
  scope: Scope,
  params: ListParams<SourceSort>,
  filters: {
    kind: (typeof SOURCE_KINDS)[number] | null;
    /** null: in use and archived. */
    active: boolean | null;
  },
) {
  // Pool counts follow the member's scope: a technician counts only their routes' pools.
  const poolCount = sql<number>`(SELECT COUNT(*) FROM ${pools} WHERE ${pools.fillSourceId} = ${fillSources.id} AND ${pools.active} = 1 AND ${poolsInScope(scope)})`.mapWith(Number);
  const lastTest = sql<string | null>`(SELECT MAX(st.sampled_on) FROM ${sourceTests} st WHERE st.fill_source_id = ${fillSources.id})`;
  const where = and(
    sourcesInScope(scope),
    params.q ? like(fillSources.name, likePattern(params.q)) : undefined,
    filters.kind ? eq(fillSources.kind, filters.kind) : undefined,
    filters.active === null ? undefined : eq(fillSources.active, filters.active),
  );
  const sorts = { name: fillSources.name, kind: fillSources.kind, pools: poolCount, lastTest };
  const select = db()
    .select({ id: fillSources.id, name: fillSources.name, kind: fillSources.kind, active: fillSources.active, poolCount, lastTest })
    .from(fillSources);
  const { rows, total } = await listPage(select, { table: fillSources, where, sorts, params });
  return { rows: rows.map((r) => ({ ...r, lastTest: r.lastTest ? String(r.lastTest).slice(0, 10) : null })), total };
}

export async function sourceForEdit(scope: Scope, sourceId: number) {
  const [row] = await db()
    .select()
    .from(fillSources)
    .where(and(sourcesInScope(scope), eq(fillSources.id, sourceId)));
  return row ?? null;
}

/**
 * One fill source with the pools it feeds (in the member's scope) and its own
 * water tests. Further analytics for a source build on this.
 */
export async function sourceDetail(scope: Scope, sourceId: number) {
  const source = await sourceForEdit(scope, sourceId);
  if (!source) return null;
  const [fed, tests] = await Promise.all([
    db()
      .select({
        id: pools.id,
        accountCode: pools.accountCode,
        street: pools.street,
        neighbourhood: pools.neighbourhood,
        routeName: routes.name,
        active: pools.active,
      })
      .from(pools)
      .leftJoin(routes, eq(routes.id, pools.routeId))
      .where(and(poolsInScope(scope), eq(pools.fillSourceId, sourceId)))
      .orderBy(asc(pools.street)),
    db()
      .select()
      .from(sourceTests)
      .where(and(eq(sourceTests.companyId, scope.companyId), eq(sourceTests.fillSourceId, sourceId)))
      .orderBy(desc(sourceTests.sampledOn), desc(sourceTests.id)),
  ]);
  return { source, pools: fed, tests };
}


/** Source names for pickers and filters, in the member's scope. */
export async function sourceOptions(scope: Scope) {
  return nameOptions(fillSources, sourcesInScope(scope));
}
