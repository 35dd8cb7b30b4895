import { and, eq } from "drizzle-orm";
import type { ProductInput } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { products } from "../../db/schema";
import type { Scope } from "../../scope";
import { conflict, isDuplicateKey, notFound, type ServiceResult } from "../../command-result";

export async function saveProduct(scope: Scope, productId: number | null, input: ProductInput): Promise<ServiceResult> {
  try {
    if (productId === null) {
      const [created] = await db()
        .insert(products)
        .values({ companyId: scope.companyId, ...input })
        .$returningId();
      return { ok: true, id: created!.id };
    }
    const [result] = await db()
      .update(products)
      .set(input)
      .where(and(eq(products.companyId, scope.companyId), eq(products.id, productId)));
    return result.affectedRows === 0 ? notFound("No product with that number in your company.") : { ok: true, id: productId };
  } catch (error) {
    if (isDuplicateKey(error, "products_company_name")) {
      return conflict("name", `Product name: "${input.name}" is already used by another product.`);
    }
    throw error;
  }
}
