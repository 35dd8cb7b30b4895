import { and, eq, sql } from "drizzle-orm";
import type { ProductInput } from "~/lib/forms/routebook";
import { keepPoolsInStep, lockPoolsForKeeping } from "../../analytics/kept/keep-pools";
import { db } from "../../db/client";
import { retryTransaction } from "../../db/retry";
import { products } from "../../db/schema";
import type { Scope } from "../../scope";
import { notFound, refuseClash, type ServiceResult } from "../../command-result";
import { saveCompanyRow } from "./save-company-row";

const NOT_FOUND = "No product with that number in your company.";
const clashOf = (input: ProductInput) => ({ key: "products_company_name", field: "name", message: `Product name: "${input.name}" is already used by another product.` });

export async function saveProduct(scope: Scope, productId: number | null, input: ProductInput): Promise<ServiceResult> {
  if (productId !== null) {
    const [current] = await db()
      .select({ category: products.category })
      .from(products)
      .where(and(eq(products.companyId, scope.companyId), eq(products.id, productId)));
    if (current && current.category !== input.category) return saveWithNewCategory(scope, productId, input);
  }
  return saveCompanyRow(scope, products, productId, input, { notFound: NOT_FOUND, clash: clashOf(input) });
}

/**
 * A product's category decides which of its treatments form treatment
 * courses, so changing it keeps the courses of every pool treated with it in
 * step, in the same transaction. The pools are locked before the product, as
 * a visit locks its pool before its treatment holds the product.
 */
async function saveWithNewCategory(scope: Scope, productId: number, input: ProductInput): Promise<ServiceResult> {
  try {
    return await retryTransaction({ unit: "product save" }, () =>
      db().transaction(async (tx) => {
        const treatedPools = async (locking: boolean) => {
          const [rows] = (await tx.execute(
            sql`SELECT DISTINCT pool_id FROM treatments WHERE product_id = ${productId} AND company_id = ${scope.companyId}${locking ? sql` LOCK IN SHARE MODE` : sql``}`,
          )) as unknown as [Array<{ pool_id: number }>];
          return rows.map((r) => Number(r.pool_id));
        };
        const seen = await treatedPools(false);
        await lockPoolsForKeeping(tx, seen);
        const [result] = await tx
          .update(products)
          .set(input)
          .where(and(eq(products.companyId, scope.companyId), eq(products.id, productId)));
        if (result.affectedRows === 0) return notFound(NOT_FOUND);
        // A treatment saved meanwhile held the product until its write committed; the locking read sees it now.
        const treated = await treatedPools(true);
        await lockPoolsForKeeping(tx, treated.filter((id) => !seen.includes(id)));
        await keepPoolsInStep(tx, scope.companyId, treated);
        return { ok: true as const, id: productId };
      }),
    );
  } catch (error) {
    return refuseClash(error, clashOf(input));
  }
}
