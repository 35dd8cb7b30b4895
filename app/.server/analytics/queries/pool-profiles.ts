import { and, asc, eq, inArray } from "drizzle-orm";
import type { Equipment, EquipmentKind, ExchangerMetal, FillSourceKind, PoolProfile, SanitiserSystem } from "@analysis/metals/route-book";
import { db } from "../../db/client";
import { inIdList } from "../../db/id-list";
import { arrayRows } from "../../db/array-rows";
import { type EQUIPMENT_KINDS, equipment, fillSources, pools, routes, type SANITISERS, type SOURCE_KINDS, type SURFACES } from "../../db/schema";
import { rowsOfTenantPools, tenantCondition, type Tenant } from "./tenant-and-window";

// The stored enum values and the analysis core's names differ in spelling only.
const SOURCE_KIND: Record<(typeof SOURCE_KINDS)[number], FillSourceKind> = {
  municipal: "municipal",
  private_well: "private-well",
  shared_well: "shared-well",
  trucked: "trucked",
  other: "other",
};
const SANITISER: Record<(typeof SANITISERS)[number], SanitiserSystem> = {
  chlorine: "chlorine",
  salt_generator: "salt-chlorine-generator",
  mineral_assist: "mineral-ioniser-assist",
  other: "other",
};
const EQUIPMENT_KIND: Record<(typeof EQUIPMENT_KINDS)[number], EquipmentKind> = {
  heater: "heater",
  heat_pump: "heat-pump",
  salt_cell: "salt-cell",
  pump: "pump",
  filter: "filter",
  ioniser: "ioniser",
  other: "other",
};

function exchangerMetal(stored: string | null): ExchangerMetal | null {
  if (stored === null) return null;
  return stored === "copper" || stored === "cupronickel" || stored === "titanium" ? stored : "none-unknown";
}

export type PoolLabel = {
  poolId: number;
  street: string;
  customerName: string;
  routeId: number | null;
  routeName: string | null;
  fillSourceId: number | null;
  fillSourceName: string | null;
  fillSourceKind: (typeof SOURCE_KINDS)[number] | null;
  neighbourhood: string | null;
  active: boolean;
};

export type RouteBookProfiles = { profiles: PoolProfile[]; labels: Map<number, PoolLabel> };

const onlyPools = (poolIds: readonly number[] | undefined) => (poolIds ? inIdList(pools.id, poolIds) : undefined);

type PoolRow = PoolLabel & { surface: (typeof SURFACES)[number] | null; sanitiser: (typeof SANITISERS)[number] | null };

/**
 * The one read of pools with their route and fill source: names for pages and
 * mail, and what the profile needs. Read as arrays: every route-book answer
 * reads all of a company's pools, and the query builder's per-value mapping
 * cost more than the read.
 */
async function poolRows(tenant: Tenant, poolIds: readonly number[] | undefined): Promise<PoolRow[]> {
  const query = db()
    .select({
      poolId: pools.id,
      street: pools.street,
      customerName: pools.customerName,
      routeId: pools.routeId,
      routeName: routes.name,
      fillSourceId: pools.fillSourceId,
      fillSourceName: fillSources.name,
      fillSourceKind: fillSources.kind,
      neighbourhood: pools.neighbourhood,
      active: pools.active,
      surface: pools.surface,
      sanitiser: pools.sanitiser,
    })
    .from(pools)
    .leftJoin(routes, eq(routes.id, pools.routeId))
    .leftJoin(fillSources, eq(fillSources.id, pools.fillSourceId))
    .where(and(tenantCondition(tenant), onlyPools(poolIds)))
    .orderBy(asc(pools.id));
  type Row = [
    poolId: number,
    street: string,
    customerName: string,
    routeId: number | null,
    routeName: string | null,
    fillSourceId: number | null,
    fillSourceName: string | null,
    fillSourceKind: PoolRow["fillSourceKind"],
    neighbourhood: string | null,
    active: number,
    surface: PoolRow["surface"],
    sanitiser: PoolRow["sanitiser"],
  ];
  return (await arrayRows<Row>(query)).map((r) => ({
    poolId: r[0],
    street: r[1],
    customerName: r[2],
    routeId: r[3],
    routeName: r[4],
    fillSourceId: r[5],
    fillSourceName: r[6],
    fillSourceKind: r[7],
    neighbourhood: r[8],
    active: r[9] === 1,
    surface: r[10],
    sanitiser: r[11],
  }));
}

const labelOf = (r: PoolRow): PoolLabel => ({
  poolId: r.poolId,
  street: r.street,
  customerName: r.customerName,
  routeId: r.routeId,
  routeName: r.routeName,
  fillSourceId: r.fillSourceId,
  fillSourceName: r.fillSourceName,
  fillSourceKind: r.fillSourceKind,
  neighbourhood: r.neighbourhood,
  active: r.active,
});

/** Each pool's street, customer, route and fill source, by pool id. */
export async function poolLabels(tenant: Tenant, options: { poolIds?: readonly number[] } = {}): Promise<Map<number, PoolLabel>> {
  if (options.poolIds && options.poolIds.length === 0) return new Map();
  return new Map((await poolRows(tenant, options.poolIds)).map((r) => [r.poolId, labelOf(r)]));
}

/** Heaters, heat pumps and ionisers of the pools, with install and removal dates and exchanger metal: by their own company column, without a pool lookup per row. */
async function fittedEquipment(tenant: Tenant, poolIds: readonly number[] | undefined): Promise<Map<number, Equipment[]>> {
  const query = db()
    .select({
      id: equipment.id,
      poolId: equipment.poolId,
      kind: equipment.kind,
      exchangerMetal: equipment.exchangerMetal,
      installedOn: equipment.installedOn,
      removedOn: equipment.removedOn,
    })
    .from(equipment)
    .where(and(rowsOfTenantPools(tenant, equipment, poolIds), inArray(equipment.kind, ["heater", "heat_pump", "ioniser"])));
  // As arrays, like the pools; a DATE comes from the driver as UTC midnight of that day.
  type Row = [
    id: number,
    poolId: number,
    kind: (typeof EQUIPMENT_KINDS)[number],
    exchangerMetal: string | null,
    installedOn: Date | null,
    removedOn: Date | null,
  ];
  const byPool = new Map<number, Equipment[]>();
  for (const [id, poolId, kind, metal, installedOn, removedOn] of await arrayRows<Row>(query)) {
    const list = byPool.get(poolId) ?? [];
    list.push({
      id: String(id),
      kind: EQUIPMENT_KIND[kind],
      exchangerMetal: exchangerMetal(metal),
      installedAt: installedOn ? installedOn.getTime() : null,
      removedAt: removedOn ? removedOn.getTime() : null,
    });
    byPool.set(poolId, list);
  }
  return byPool;
}

/**
 * What the analysis needs to know about each pool of the tenant: fill source
 * and its kind, neighbourhood, route, surface, sanitiser, and the heaters and
 * ionisers with their install and removal dates and exchanger metal.
 */
export async function poolProfiles(tenant: Tenant, options: { poolIds?: readonly number[] } = {}): Promise<RouteBookProfiles> {
  if (options.poolIds && options.poolIds.length === 0) return { profiles: [], labels: new Map() };
  const [rows, equipmentByPool] = await Promise.all([poolRows(tenant, options.poolIds), fittedEquipment(tenant, options.poolIds)]);
  const labels = new Map<number, PoolLabel>();
  const profiles = rows.map((r) => {
    labels.set(r.poolId, labelOf(r));
    return {
      poolId: String(r.poolId),
      fillSourceId: r.fillSourceId === null ? null : String(r.fillSourceId),
      fillSourceKind: r.fillSourceKind === null ? null : SOURCE_KIND[r.fillSourceKind],
      neighbourhood: r.neighbourhood,
      routeId: r.routeId === null ? null : String(r.routeId),
      surface: r.surface,
      sanitiser: r.sanitiser === null ? null : SANITISER[r.sanitiser],
      equipment: equipmentByPool.get(r.poolId) ?? [],
    } satisfies PoolProfile;
  });
  return { profiles, labels };
}
