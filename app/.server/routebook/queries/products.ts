import { and, asc, eq, like } from "drizzle-orm";
import { likePattern, type ListParams } from "~/lib/list-params";
import type { PRODUCT_CATEGORIES } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { products } from "../../db/schema";
import type { Scope } from "../../scope";
import { listPage } from "./list-page";

export const PRODUCT_SORTS = ["name", "category", "labelDose", "unitCost"] as const;
export type ProductSort = (typeof PRODUCT_SORTS)[number];

export type ProductFilters = {
  category: (typeof PRODUCT_CATEGORIES)[number] | null;
  /** null: active and archived. */
  active: boolean | null;
};

export async function listProducts(scope: Scope, params: ListParams<ProductSort>, filters: ProductFilters) {
  const where = and(
    eq(products.companyId, scope.companyId),
    params.q ? like(products.name, likePattern(params.q)) : undefined,
    filters.category ? eq(products.category, filters.category) : undefined,
    filters.active === null ? undefined : eq(products.active, filters.active),
  );
  const sorts = { name: products.name, category: products.category, labelDose: products.labelDose, unitCost: products.unitCost };
  return listPage(db().select().from(products), { table: products, where, sorts, params });
}

export async function productForEdit(scope: Scope, productId: number) {
  const [row] = await db()
    .select()
    .from(products)
    .where(and(eq(products.companyId, scope.companyId), eq(products.id, productId)));
  return row ?? null;
}

/** Active products for the visit form's treatment picker. */
export async function activeProducts(scope: Scope) {
  return db()
    .select({
      id: products.id,
      name: products.name,
      category: products.category,
      labelDose: products.labelDose,
      maintenanceDose: products.maintenanceDose,
      doseUnit: products.doseUnit,
      doseBasis: products.doseBasis,
      unitCost: products.unitCost,
    })
    .from(products)
    .where(and(eq(products.companyId, scope.companyId), eq(products.active, true)))
    .orderBy(asc(products.name));
}
