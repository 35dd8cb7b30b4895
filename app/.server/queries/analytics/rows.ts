import { and, asc, count, eq, inArray, max, min } from "drizzle-orm";
import type { MetalReading } from "@analysis/metals/reading";
import type {
  Equipment,
  EquipmentKind,
  ExchangerMetal,
  FillSourceKind,
  PoolProfile,
  SanitiserSystem,
} from "@analysis/metals/route-book";
import { db } from "../../db/client";
import { type EQUIPMENT_KINDS, equipment, fillSources, pools, routes, type SANITISERS, type SOURCE_KINDS, sourceTests, waterTests } from "../../db/schema";
import { type Scope, poolsInScope } from "../../scope";
import { metalReading, withinWindow } from "../metal-readings";
import type { AnalyticsWindow } from "./window";

// The stored enum values and the analysis core's names differ in spelling only.
export const SOURCE_KIND: Record<(typeof SOURCE_KINDS)[number], FillSourceKind> = {
  municipal: "municipal",
  private_well: "private-well",
  shared_well: "shared-well",
  trucked: "trucked",
  other: "other",
};
export const SANITISER: Record<(typeof SANITISERS)[number], SanitiserSystem> = {
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

/** A stored calendar date ("YYYY-MM-DD") as the epoch milliseconds of its UTC midnight. */
export function dayToMs(day: string | null): number | null {
  return day ? Date.parse(`${day}T00:00:00Z`) : null;
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
};

export type RouteBookProfiles = {
  profiles: PoolProfile[];
  labels: Map<number, PoolLabel>;
};

/**
 * What the analysis needs to know about each pool in scope: fill source and
 * its kind, neighbourhood, route, surface, sanitiser, and the heaters and
 * ionisers with their install and removal dates and exchanger metal.
 */
export async function poolProfiles(scope: Scope, options: { poolIds?: readonly number[] } = {}): Promise<RouteBookProfiles> {
  if (options.poolIds && options.poolIds.length === 0) return { profiles: [], labels: new Map() };
  const onlyThese = options.poolIds ? inArray(pools.id, [...options.poolIds]) : undefined;
  const [rows, fitted] = await Promise.all([
    db()
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
        surface: pools.surface,
        sanitiser: pools.sanitiser,
      })
      .from(pools)
      .leftJoin(routes, eq(routes.id, pools.routeId))
      .leftJoin(fillSources, eq(fillSources.id, pools.fillSourceId))
      .where(and(poolsInScope(scope), onlyThese))
      .orderBy(asc(pools.id)),
    db()
      .select({
        id: equipment.id,
        poolId: equipment.poolId,
        kind: equipment.kind,
        exchangerMetal: equipment.exchangerMetal,
        installedOn: equipment.installedOn,
        removedOn: equipment.removedOn,
      })
      .from(equipment)
      .innerJoin(pools, eq(pools.id, equipment.poolId))
      .where(
        and(
          poolsInScope(scope),
          eq(equipment.companyId, scope.companyId),
          inArray(equipment.kind, ["heater", "heat_pump", "ioniser"]),
          options.poolIds ? inArray(equipment.poolId, [...options.poolIds]) : undefined,
        ),
      ),
  ]);
  const equipmentByPool = new Map<number, Equipment[]>();
  for (const e of fitted) {
    const list = equipmentByPool.get(e.poolId) ?? [];
    list.push({
      id: String(e.id),
      kind: EQUIPMENT_KIND[e.kind],
      exchangerMetal: exchangerMetal(e.exchangerMetal),
      installedAt: dayToMs(e.installedOn),
      removedAt: dayToMs(e.removedOn),
    });
    equipmentByPool.set(e.poolId, list);
  }
  const labels = new Map<number, PoolLabel>();
  const profiles = rows.map((r) => {
    labels.set(r.poolId, {
      poolId: r.poolId,
      street: r.street,
      customerName: r.customerName,
      routeId: r.routeId,
      routeName: r.routeName,
      fillSourceId: r.fillSourceId,
      fillSourceName: r.fillSourceName,
      fillSourceKind: r.fillSourceKind,
      neighbourhood: r.neighbourhood,
    });
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

export type ObservedSpan = { poolId: string; firstAt: number; lastAt: number; tests: number };

/**
 * Each pool's first and last test in the window (any analyte): the time it
 * was observed. Grouped in MariaDB, one row per pool.
 */
export async function observedSpans(scope: Scope, window: AnalyticsWindow): Promise<ObservedSpan[]> {
  const rows = await db()
    .select({
      poolId: waterTests.poolId,
      firstAt: min(waterTests.sampledAt),
      lastAt: max(waterTests.sampledAt),
      tests: count(),
    })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(and(poolsInScope(scope), eq(waterTests.companyId, scope.companyId), ...withinWindow(waterTests.sampledAt, window)))
    .groupBy(waterTests.poolId);
  return rows
    .filter((r) => r.firstAt !== null && r.lastAt !== null)
    .map((r) => ({ poolId: String(r.poolId), firstAt: r.firstAt!.getTime(), lastAt: r.lastAt!.getTime(), tests: r.tests }));
}

export type SourceTestRow = {
  id: number;
  fillSourceId: number;
  sampledOn: string;
  copper: MetalReading | null;
  iron: MetalReading | null;
  manganese: MetalReading | null;
};

/** Fill-water tests of the company's sources (optionally only some sources), oldest first. */
export async function sourceTestRows(companyId: number, sourceIds?: readonly number[]): Promise<SourceTestRow[]> {
  if (sourceIds && sourceIds.length === 0) return [];
  const rows = await db()
    .select()
    .from(sourceTests)
    .where(and(eq(sourceTests.companyId, companyId), sourceIds ? inArray(sourceTests.fillSourceId, [...sourceIds]) : undefined))
    .orderBy(asc(sourceTests.fillSourceId), asc(sourceTests.sampledOn));
  return rows.map((r) => ({
    id: r.id,
    fillSourceId: r.fillSourceId,
    sampledOn: r.sampledOn,
    copper: metalReading(r.copper, r.copperBelowDetection),
    iron: metalReading(r.iron, r.ironBelowDetection),
    manganese: metalReading(r.manganese, r.manganeseBelowDetection),
  }));
}
