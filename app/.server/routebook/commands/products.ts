import type { ProductInput } from "~/lib/forms/routebook";
import { products } from "../../db/schema";
import type { Scope } from "../../scope";
import type { ServiceResult } from "../../command-result";
import { saveCompanyRow } from "./save-company-row";

export async function saveProduct(scope: Scope, productId: number | null, input: ProductInput): Promise<ServiceResult> {
  return saveCompanyRow(scope, products, productId, input, {
    notFound: "No product with that number in your company.",
    clash: { key: "products_company_name", field: "name", message: `Product name: "${input.name}" is already used by another product.` },
  });
}
