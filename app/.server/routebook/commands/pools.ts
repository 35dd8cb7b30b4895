import { and, eq, isNull } from "drizzle-orm";
import type { EquipmentInput, PoolInput } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { equipment, fillSources, pools, routes } from "../../db/schema";
import type { Scope } from "../../scope";
import { conflict, invalid, notFound, type ServiceResult } from "../../command-result";
import { saveCompanyRow } from "./save-company-row";

type Tx = Parameters<Parameters<ReturnType<typeof db>["transaction"]>[0]>[0];

/** What the pool points at now: an archived route or source it already has may stay. */
async function currentReferences(scope: Scope, poolId: number | null) {
  if (poolId === null) return null;
  const [row] = await db()
    .select({ routeId: pools.routeId, fillSourceId: pools.fillSourceId })
    .from(pools)
    .where(and(eq(pools.companyId, scope.companyId), eq(pools.id, poolId)));
  return row ?? null;
}

async function foreignReferences(scope: Scope, poolId: number | null, input: PoolInput) {
  const errors: Record<string, string> = {};
  const current = await currentReferences(scope, poolId);
  if (input.routeId !== null) {
    const [route] = await db()
      .select({ id: routes.id, name: routes.name, active: routes.active })
      .from(routes)
      .where(and(eq(routes.companyId, scope.companyId), eq(routes.id, input.routeId)));
    if (!route) errors.routeId = `Route: ${input.routeId} is not one of this company's routes.`;
    else if (!route.active && current?.routeId !== route.id) {
      errors.routeId = `Route: "${route.name}" is archived; restore it on its page or choose another route.`;
    }
  }
  if (input.fillSourceId !== null) {
    const [source] = await db()
      .select({ id: fillSources.id, name: fillSources.name, active: fillSources.active })
      .from(fillSources)
      .where(and(eq(fillSources.companyId, scope.companyId), eq(fillSources.id, input.fillSourceId)));
    if (!source) errors.fillSourceId = `Fill source: ${input.fillSourceId} is not one of this company's sources.`;
    else if (!source.active && current?.fillSourceId !== source.id) {
      errors.fillSourceId = `Fill source: "${source.name}" is archived; restore it on its page or choose another source.`;
    }
  }
  return errors;
}

/** Creates or changes a pool. Archiving is `active: false`; pools with history are never deleted. */
export async function savePool(scope: Scope, poolId: number | null, input: PoolInput): Promise<ServiceResult> {
  const errors = await foreignReferences(scope, poolId, input);
  if (Object.keys(errors).length > 0) return invalid(errors);
  return saveCompanyRow(scope, pools, poolId, input, {
    notFound: "No pool with that number in your company.",
    clash: { key: "pools_company_account", field: "accountCode", message: `Account code: "${input.accountCode}" is already used by another pool.` },
  });
}

async function lockPool(tx: Tx, scope: Scope, poolId: number) {
  const [pool] = await tx
    .select({ id: pools.id })
    .from(pools)
    .where(and(eq(pools.companyId, scope.companyId), eq(pools.id, poolId)))
    .for("update");
  return pool ?? null;
}

function sameItem(a: typeof equipment.$inferSelect, b: EquipmentInput) {
  return (
    a.kind === b.kind &&
    (a.exchangerMetal ?? null) === b.exchangerMetal &&
    (a.description ?? null) === b.description &&
    (a.installedOn ?? null) === b.installedOn
  );
}

/**
 * Fits equipment to a pool. With `replacesId`, the old item gets a removed
 * date (the new one's install date, or today) and stays on record, so the age
 * of the old heater at each past test is still known. An identical item
 * already in place is taken as a repeated submit.
 */
export async function fitEquipment(
  scope: Scope,
  poolId: number,
  input: EquipmentInput,
  today: string,
  replacesId: number | null = null,
): Promise<ServiceResult<{ id: number; repeated: boolean }>> {
  if (input.installedOn && input.installedOn > today) {
    return invalid({ installedOn: `Installed on: ${input.installedOn} is later than today (${today}).` });
  }
  return db().transaction(async (tx) => {
    if (!(await lockPool(tx, scope, poolId))) return notFound("No pool with that number in your company.");
    const current = await tx
      .select()
      .from(equipment)
      .where(and(eq(equipment.poolId, poolId), isNull(equipment.removedOn)));
    const repeat = current.find((item) => item.id !== replacesId && sameItem(item, input));
    if (replacesId !== null) {
      const [old] = await tx
        .select()
        .from(equipment)
        .where(and(eq(equipment.companyId, scope.companyId), eq(equipment.poolId, poolId), eq(equipment.id, replacesId)));
      if (!old) return notFound("That equipment is not on this pool.");
      if (old.removedOn) {
        if (repeat) return { ok: true as const, id: repeat.id, repeated: true };
        return conflict("equipmentId", `Equipment: this ${old.kind} was already removed on ${old.removedOn}.`);
      }
      const removedOn = input.installedOn ?? today;
      if (old.installedOn && removedOn < old.installedOn) {
        return invalid({
          installedOn: `Installed on: ${removedOn} is before the old ${old.kind} was installed (${old.installedOn}).`,
        });
      }
      await tx.update(equipment).set({ removedOn }).where(eq(equipment.id, replacesId));
    } else if (repeat) {
      return { ok: true as const, id: repeat.id, repeated: true };
    }
    const [created] = await tx
      .insert(equipment)
      .values({ companyId: scope.companyId, poolId, ...input })
      .$returningId();
    return { ok: true as const, id: created!.id, repeated: false };
  });
}

/** Takes equipment off a pool without a replacement; its history stays. */
export async function removeEquipment(
  scope: Scope,
  poolId: number,
  equipmentId: number,
  removedOn: string,
  today: string,
): Promise<ServiceResult> {
  if (removedOn > today) return invalid({ removedOn: `Removed on: ${removedOn} is later than today (${today}).` });
  const [item] = await db()
    .select()
    .from(equipment)
    .where(and(eq(equipment.companyId, scope.companyId), eq(equipment.poolId, poolId), eq(equipment.id, equipmentId)));
  if (!item) return notFound("That equipment is not on this pool.");
  if (item.removedOn) return item.removedOn === removedOn ? { ok: true, id: item.id } : conflict("equipmentId", `Equipment: already removed on ${item.removedOn}.`);
  if (item.installedOn && removedOn < item.installedOn) {
    return invalid({ removedOn: `Removed on: ${removedOn} is before it was installed (${item.installedOn}).` });
  }
  await db().update(equipment).set({ removedOn }).where(eq(equipment.id, equipmentId));
  return { ok: true, id: item.id };
}
