import { and, asc, count, eq, gte, inArray, isNotNull, lte, max, min, or, type SQL } from "drizzle-orm";
import type { MetalTest } from "@analysis/metals/episodes";
import { METALS, type Metal, type MetalReading } from "@analysis/metals/reading";
import type {
  Equipment,
  EquipmentKind,
  ExchangerMetal,
  FillSourceKind,
  PoolProfile,
  SanitiserSystem,
} from "@analysis/metals/route-book";
import type { ProductCategory, TreatmentRecord } from "@analysis/outcomes/treatments";
import { db } from "../../db/client";
import {
  EQUIPMENT_KINDS,
  equipment,
  fillSources,
  PRODUCT_CATEGORIES,
  pools,
  products,
  routes,
  SANITISERS,
  SOURCE_KINDS,
  sourceTests,
  treatments,
  waterTests,
} from "../../db/schema";
import type { Scope } from "../../guard";
import { poolsInScope } from "../scope";
import type { AnalyticsWindow } from "./window";

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
export const PRODUCT_CATEGORY: Record<(typeof PRODUCT_CATEGORIES)[number], ProductCategory> = {
  sequestrant: "sequestrant",
  collector_pad: "metal-collector-pad",
  ph_decreaser: "ph-decreaser",
  copper_algaecide: "copper-algaecide",
  other_algaecide: "other-algaecide",
  chlorine: "chlorine",
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

function windowConditions(column: typeof waterTests.sampledAt | typeof treatments.appliedAt, window: AnalyticsWindow): SQL[] {
  const conditions: SQL[] = [];
  if (window.from) conditions.push(gte(column, window.from));
  if (window.to) conditions.push(lte(column, window.to));
  return conditions;
}

const reading = (value: number | null, belowDetection: boolean): MetalReading | null =>
  value === null ? null : { value: Number(value), belowDetection };

export type MetalReadingQuery = {
  window: AnalyticsWindow;
  /** Only these metals are read; rows without any of them are skipped. Default: all three. */
  metals?: readonly Metal[];
  poolIds?: readonly number[];
};

/**
 * Metal readings of the pools in scope, ordered by pool and time, as the
 * episode analysis reads them. Only tests where a metal was measured, and
 * only the columns the metal history needs.
 */
export async function metalReadings(scope: Scope, query: MetalReadingQuery): Promise<MetalTest[]> {
  const metals = query.metals ?? METALS;
  if (query.poolIds && query.poolIds.length === 0) return [];
  const measured = or(...metals.map((metal) => isNotNull(waterTests[metal])))!;
  const rows = await db()
    .select({
      id: waterTests.id,
      poolId: waterTests.poolId,
      sampledAt: waterTests.sampledAt,
      copper: waterTests.copper,
      copperBelowDetection: waterTests.copperBelowDetection,
      iron: waterTests.iron,
      ironBelowDetection: waterTests.ironBelowDetection,
      manganese: waterTests.manganese,
      manganeseBelowDetection: waterTests.manganeseBelowDetection,
    })
    .from(waterTests)
    .innerJoin(pools, eq(pools.id, waterTests.poolId))
    .where(
      and(
        poolsInScope(scope),
        eq(waterTests.companyId, scope.companyId),
        measured,
        ...windowConditions(waterTests.sampledAt, query.window),
        query.poolIds ? inArray(waterTests.poolId, [...query.poolIds]) : undefined,
      ),
    )
    .orderBy(asc(waterTests.poolId), asc(waterTests.sampledAt));
  const wanted = new Set(metals);
  return rows.map((r) => ({
    id: String(r.id),
    poolId: String(r.poolId),
    takenAt: r.sampledAt.getTime(),
    copper: wanted.has("copper") ? reading(r.copper, r.copperBelowDetection) : null,
    iron: wanted.has("iron") ? reading(r.iron, r.ironBelowDetection) : null,
    manganese: wanted.has("manganese") ? reading(r.manganese, r.manganeseBelowDetection) : null,
  }));
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
    .where(and(poolsInScope(scope), eq(waterTests.companyId, scope.companyId), ...windowConditions(waterTests.sampledAt, window)))
    .groupBy(waterTests.poolId);
  return rows
    .filter((r) => r.firstAt !== null && r.lastAt !== null)
    .map((r) => ({ poolId: String(r.poolId), firstAt: r.firstAt!.getTime(), lastAt: r.lastAt!.getTime(), tests: r.tests }));
}

export type TreatmentRow = TreatmentRecord & { productName: string; amount: number; unit: string };

/** Treatments of the pools in scope with their product and category, oldest first. */
export async function treatmentRows(
  scope: Scope,
  query: { window: AnalyticsWindow; poolIds?: readonly number[]; categories?: readonly (typeof PRODUCT_CATEGORIES)[number][] },
): Promise<TreatmentRow[]> {
  if (query.poolIds && query.poolIds.length === 0) return [];
  const rows = await db()
    .select({
      id: treatments.id,
      poolId: treatments.poolId,
      productId: treatments.productId,
      productName: products.name,
      category: products.category,
      appliedAt: treatments.appliedAt,
      cost: treatments.cost,
      amount: treatments.amount,
      unit: treatments.unit,
    })
    .from(treatments)
    .innerJoin(pools, eq(pools.id, treatments.poolId))
    .innerJoin(products, eq(products.id, treatments.productId))
    .where(
      and(
        poolsInScope(scope),
        eq(treatments.companyId, scope.companyId),
        ...windowConditions(treatments.appliedAt, query.window),
        query.poolIds ? inArray(treatments.poolId, [...query.poolIds]) : undefined,
        query.categories ? inArray(products.category, [...query.categories]) : undefined,
      ),
    )
    .orderBy(asc(treatments.poolId), asc(treatments.appliedAt));
  return rows.map((r) => ({
    id: String(r.id),
    poolId: String(r.poolId),
    productId: String(r.productId),
    productName: r.productName,
    category: PRODUCT_CATEGORY[r.category],
    appliedAt: r.appliedAt.getTime(),
    cost: r.cost,
    amount: r.amount,
    unit: r.unit,
  }));
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
    copper: reading(r.copper, r.copperBelowDetection),
    iron: reading(r.iron, r.ironBelowDetection),
    manganese: reading(r.manganese, r.manganeseBelowDetection),
  }));
}
