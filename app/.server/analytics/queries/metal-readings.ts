import { and, asc, eq, inArray, isNotNull, or, sql, type SQL } from "drizzle-orm";
import type { HardnessEndpoint, MetalTest } from "@analysis/metals/episodes";
import type { OutcomeTest, ProductCategory, TreatmentRecord } from "@analysis/outcomes/treatments";
import { METALS, type Metal, type MetalReading } from "@analysis/metals/reading";
import { db, pool } from "../../db/client";
import { inIdList } from "../../db/id-list";
import { type PRODUCT_CATEGORIES, pools, products, treatments, waterTests } from "../../db/schema";
import { tenantCondition, testsInScope, withinWindow, type Tenant, type TimeWindow } from "./tenant-and-window";

export const PRODUCT_CATEGORY: Record<(typeof PRODUCT_CATEGORIES)[number], ProductCategory> = {
  sequestrant: "sequestrant",
  collector_pad: "metal-collector-pad",
  ph_decreaser: "ph-decreaser",
  copper_algaecide: "copper-algaecide",
  other_algaecide: "other-algaecide",
  chlorine: "chlorine",
  other: "other",
};

/** A stored value and its below-detection flag as the analysis core reads it. */
export function metalReading(value: number | null, belowDetection: boolean): MetalReading | null {
  return value === null ? null : { value: Number(value), belowDetection };
}

/** Tests with at least one of these metals measured. */
export function anyMetalMeasured(metals: readonly Metal[] = METALS): SQL {
  return or(...metals.map((metal) => isNotNull(waterTests[metal])))!;
}

export type WaterTestQuery = {
  poolIds?: readonly number[];
  window?: TimeWindow;
  /** Metals read into each test; the others stay null. Default: all three. */
  metals?: readonly Metal[];
  /** Further conditions on the tests (e.g. only those where a metal was measured). */
  where?: SQL;
  /** Also read the pH (treatment outcomes) or the hardness endpoint (suspected metals). */
  with?: { ph?: boolean; hardnessEndpoint?: boolean };
};

/**
 * Water tests as the analysis core reads them (metal readings, and pH or the
 * hardness endpoint when asked), ordered by pool and time: the order
 * analyseMetalHistory uses as is.
 */
export async function waterTestReadings(tenant: Tenant, query: WaterTestQuery = {}): Promise<OutcomeTest[]> {
  if (query.poolIds && query.poolIds.length === 0) return [];
  // Columns not asked for are read as NULL, so each query carries only what its analysis needs.
  const select = db()
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
      ph: query.with?.ph ? waterTests.ph : sql<number | null>`NULL`,
      hardnessEndpoint: query.with?.hardnessEndpoint ? waterTests.hardnessEndpoint : sql<HardnessEndpoint | null>`NULL`,
    })
    .from(waterTests)
    .$dynamic();
  const built = ("scope" in tenant ? select.innerJoin(pools, eq(pools.id, waterTests.poolId)) : select)
    .where(
      and(
        testsInScope(tenant, query.window),
        query.poolIds ? inIdList(waterTests.poolId, query.poolIds) : undefined,
        query.where,
      ),
    )
    // The id settles tests taken at the same instant, so kept and recomputed answers read them alike.
    .orderBy(asc(waterTests.poolId), asc(waterTests.sampledAt), asc(waterTests.id))
    .toSQL();
  // Hundreds of thousands of rows on a large route book: read them as arrays with
  // the driver's own date and decimal parsing, which costs a fraction of the query
  // builder's per-value conversion. Columns come in the order selected above.
  const [rows] = (await pool().query({ sql: built.sql, rowsAsArray: true }, built.params)) as unknown as [WaterTestRow[]];
  const wanted = new Set(query.metals ?? METALS);
  const withCopper = wanted.has("copper");
  const withIron = wanted.has("iron");
  const withManganese = wanted.has("manganese");
  return rows.map(([id, poolId, sampledAt, copper, copperBelow, iron, ironBelow, manganese, manganeseBelow, ph, hardnessEndpoint]) => ({
    id: String(id),
    poolId: String(poolId),
    takenAt: sampledAt.getTime(),
    ...(query.with?.ph ? { ph } : {}),
    copper: withCopper ? metalReading(copper, copperBelow === 1) : null,
    iron: withIron ? metalReading(iron, ironBelow === 1) : null,
    manganese: withManganese ? metalReading(manganese, manganeseBelow === 1) : null,
    ...(query.with?.hardnessEndpoint ? { hardnessEndpoint } : {}),
  }));
}

/** One selected water-test row as the driver returns it (booleans are TINYINT 0/1). */
type WaterTestRow = [
  id: number,
  poolId: number,
  sampledAt: Date,
  copper: number | null,
  copperBelow: number,
  iron: number | null,
  ironBelow: number,
  manganese: number | null,
  manganeseBelow: number,
  ph: number | null,
  hardnessEndpoint: HardnessEndpoint | null,
];

/**
 * Metal readings, ordered by pool and time, as the episode analysis reads
 * them: only tests where one of the metals asked for was measured, and only
 * the columns the metal history needs.
 */
export function metalReadings(tenant: Tenant, query: Omit<WaterTestQuery, "where" | "with"> = {}): Promise<MetalTest[]> {
  return waterTestReadings(tenant, { ...query, where: anyMetalMeasured(query.metals) });
}

export type TreatmentRow = TreatmentRecord & { productName: string; amount: number; unit: string };

/** Treatments with their product and category, ordered by pool and time. */
export async function treatmentRows(
  tenant: Tenant,
  query: { window?: TimeWindow; poolIds?: readonly number[]; categories?: readonly (typeof PRODUCT_CATEGORIES)[number][] } = {},
): Promise<TreatmentRow[]> {
  if (query.poolIds && query.poolIds.length === 0) return [];
  const select = db()
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
    .$dynamic();
  const rows = await ("scope" in tenant ? select.innerJoin(pools, eq(pools.id, treatments.poolId)) : select)
    .innerJoin(products, eq(products.id, treatments.productId))
    .where(
      and(
        tenantCondition(tenant, treatments.companyId),
        withinWindow(treatments.appliedAt, query.window),
        query.poolIds ? inIdList(treatments.poolId, query.poolIds) : undefined,
        query.categories ? inArray(products.category, [...query.categories]) : undefined,
      ),
    )
    // Treatments given together keep the order they were recorded in (a course's combination is named in that order).
    .orderBy(asc(treatments.poolId), asc(treatments.appliedAt), asc(treatments.id));
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
