import { and, eq, inArray } from "drizzle-orm";
import type { RouteInput } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { memberships, routes, routeTechnicians } from "../../db/schema";
import type { Scope } from "../../scope";
import { invalid, notFound, refuseClash, type ServiceResult } from "../../command-result";

async function unknownTechnicians(scope: Scope, ids: string[]): Promise<string[]> {
  if (ids.length === 0) return [];
  const found = await db()
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.companyId, scope.companyId), eq(memberships.role, "technician"), inArray(memberships.userId, ids)));
  const known = new Set(found.map((f) => f.userId));
  return ids.filter((id) => !known.has(id));
}

/**
 * Creates a route (routeId null) or changes one, with its technicians, in one
 * transaction. Archiving is `active: false`; routes are never deleted.
 */
export async function saveRoute(scope: Scope, routeId: number | null, input: RouteInput): Promise<ServiceResult> {
  const strangers = await unknownTechnicians(scope, input.technicianIds);
  if (strangers.length > 0) {
    return invalid({ technicianIds: `Technicians: "${strangers[0]}" is not a technician of this company.` });
  }
  try {
    const id = await db().transaction(async (tx) => {
      let id = routeId;
      if (id === null) {
        const [created] = await tx
          .insert(routes)
          .values({ companyId: scope.companyId, name: input.name, serviceWeekdays: input.serviceWeekdays, active: input.active })
          .$returningId();
        id = created!.id;
      } else {
        const [result] = await tx
          .update(routes)
          .set({ name: input.name, serviceWeekdays: input.serviceWeekdays, active: input.active })
          .where(and(eq(routes.companyId, scope.companyId), eq(routes.id, id)));
        if (result.affectedRows === 0) return null;
        await tx.delete(routeTechnicians).where(eq(routeTechnicians.routeId, id));
      }
      if (input.technicianIds.length > 0) {
        await tx.insert(routeTechnicians).values(input.technicianIds.map((userId) => ({ routeId: id!, userId })));
      }
      return id;
    });
    return id === null ? notFound("No route with that number in your company.") : { ok: true, id };
  } catch (error) {
    return refuseClash(error, { key: "routes_company_name", field: "name", message: `Route name: "${input.name}" is already used by another route.` });
  }
}
