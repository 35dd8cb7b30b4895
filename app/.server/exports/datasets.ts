import { and, type AnyColumn, asc, eq, gt, type SQL } from "drizzle-orm";
import type { MySqlSelect } from "drizzle-orm/mysql-core";
import { db } from "../db/client";
import { fillSources, pools, products, routes, treatments, waterTests } from "../db/schema";
import { type Scope, poolsInScope } from "../scope";
import { type CsvCell, csvLine, csvLines } from "~/lib/csv";

export const DATASETS = {
  "water-tests": "Water tests",
  treatments: "Treatments",
  pools: "Pools",
  products: "Products",
  "fill-sources": "Fill sources",
} as const;
export type Dataset = keyof typeof DATASETS;

type Page = { rows: CsvCell[][]; lastId: number | null };
type Source = { headers: string[]; page: (afterId: number, size: number) => Promise<Page> };

const PAGE_SIZE = 5000;

/**
 * A data set's page reader: the rows of `select` (its select, from and joins)
 * under `where` whose `id` comes after the last page's, in id order, each
 * written out as its id and CSV cells.
 */
function pagesInIdOrder<Select extends MySqlSelect>(
  id: AnyColumn,
  where: SQL | undefined,
  select: () => { $dynamic(): Select },
  line: (row: Awaited<Select>[number]) => { id: number; cells: CsvCell[] },
): Source["page"] {
  return async (afterId, size) => {
    const rows = (await select()
      .$dynamic()
      .where(and(where, gt(id, afterId)))
      .orderBy(asc(id))
      .limit(size)) as Awaited<Select>;
    const lines = rows.map(line);
    return { lastId: lines.at(-1)?.id ?? null, rows: lines.map((l) => l.cells) };
  };
}

/** Each data set reads in id order, one page at a time, always inside the member's scope. */
function source(scope: Scope, dataset: Dataset): Source {
  switch (dataset) {
    case "water-tests":
      return {
        headers: [
          "test_id", "account_code", "street", "sampled_at_utc", "free_chlorine_mg_l", "combined_chlorine_mg_l", "ph",
          "total_alkalinity_mg_l", "calcium_hardness_mg_l", "cyanuric_acid_mg_l", "salt_mg_l", "tds_mg_l", "temperature_c",
          "copper_mg_l", "copper_below_detection", "iron_mg_l", "iron_below_detection", "manganese_mg_l",
          "manganese_below_detection", "hardness_endpoint", "stain", "stain_colour", "pad_tint", "note", "import_batch_id",
        ],
        page: pagesInIdOrder(
          waterTests.id,
          and(poolsInScope(scope), eq(waterTests.companyId, scope.companyId)),
          () =>
            db()
              .select({ t: waterTests, accountCode: pools.accountCode, street: pools.street })
              .from(waterTests)
              .innerJoin(pools, eq(pools.id, waterTests.poolId)),
          ({ t, accountCode, street }) => ({
            id: t.id,
            cells: [
              t.id, accountCode, street, t.sampledAt, t.freeChlorine, t.combinedChlorine, t.ph, t.totalAlkalinity,
              t.calciumHardness, t.cyanuricAcid, t.salt, t.tds, t.temperatureC, t.copper, t.copperBelowDetection, t.iron,
              t.ironBelowDetection, t.manganese, t.manganeseBelowDetection, t.hardnessEndpoint, t.stain, t.stainColour,
              t.padTint, t.note, t.importBatchId,
            ],
          }),
        ),
      };
    case "treatments":
      return {
        headers: ["treatment_id", "account_code", "street", "applied_at_utc", "product", "category", "amount", "unit", "cost", "water_test_id", "import_batch_id"],
        page: pagesInIdOrder(
          treatments.id,
          and(poolsInScope(scope), eq(treatments.companyId, scope.companyId)),
          () =>
            db()
              .select({ t: treatments, accountCode: pools.accountCode, street: pools.street, product: products.name, category: products.category })
              .from(treatments)
              .innerJoin(pools, eq(pools.id, treatments.poolId))
              .innerJoin(products, eq(products.id, treatments.productId)),
          ({ t, accountCode, street, product, category }) => ({
            id: t.id,
            cells: [t.id, accountCode, street, t.appliedAt, product, category, t.amount, t.unit, t.cost, t.waterTestId, t.importBatchId],
          }),
        ),
      };
    case "pools":
      return {
        headers: ["pool_id", "account_code", "customer_name", "customer_phone", "customer_email", "street", "neighbourhood", "postal_code", "route", "fill_source", "volume_litres", "surface", "sanitiser", "active"],
        page: pagesInIdOrder(
          pools.id,
          poolsInScope(scope),
          () =>
            db()
              .select({ p: pools, route: routes.name, source: fillSources.name })
              .from(pools)
              .leftJoin(routes, eq(routes.id, pools.routeId))
              .leftJoin(fillSources, eq(fillSources.id, pools.fillSourceId)),
          ({ p, route, source: fill }) => ({
            id: p.id,
            cells: [
              p.id, p.accountCode, p.customerName, p.customerPhone, p.customerEmail, p.street, p.neighbourhood, p.postalCode,
              route, fill, p.volumeLitres, p.surface, p.sanitiser, p.active,
            ],
          }),
        ),
      };
    case "products":
      return {
        headers: ["product_id", "name", "category", "label_dose", "maintenance_dose", "dose_unit", "dose_basis", "unit_cost", "active"],
        page: pagesInIdOrder(
          products.id,
          eq(products.companyId, scope.companyId),
          () => db().select().from(products),
          (p) => ({ id: p.id, cells: [p.id, p.name, p.category, p.labelDose, p.maintenanceDose, p.doseUnit, p.doseBasis, p.unitCost, p.active] }),
        ),
      };
    case "fill-sources":
      return {
        headers: ["fill_source_id", "name", "kind", "notes"],
        page: pagesInIdOrder(
          fillSources.id,
          eq(fillSources.companyId, scope.companyId),
          () => db().select().from(fillSources),
          (s) => ({ id: s.id, cells: [s.id, s.name, s.kind, s.notes] }),
        ),
      };
  }
}

/** A CSV stream of one data set: read page by page so a large company never sits in memory whole. */
export function exportStream(scope: Scope, dataset: Dataset): ReadableStream<Uint8Array> {
  const { headers, page } = source(scope, dataset);
  const encoder = new TextEncoder();
  let afterId = 0;
  let started = false;
  return new ReadableStream({
    async pull(controller) {
      try {
        if (!started) {
          started = true;
          // A byte-order mark so spreadsheet programs read the UTF-8 names correctly.
          controller.enqueue(encoder.encode(`\uFEFF${csvLine(headers)}`));
          return;
        }
        const next = await page(afterId, PAGE_SIZE);
        if (next.rows.length > 0) controller.enqueue(encoder.encode(csvLines(next.rows)));
        if (next.lastId === null || next.rows.length < PAGE_SIZE) controller.close();
        else afterId = next.lastId;
      } catch (error) {
        controller.error(error);
      }
    },
  });
}
