import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { productForEdit } from "~/.server/routebook/queries/products";
import { refusedAnswer } from "~/.server/command-result";
import { saveProduct } from "~/.server/routebook/commands/products";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { ProductForm } from "~/components/routebook/simple-forms";
import { formObject } from "~/lib/forms/fields";
import { parseProductForm } from "~/lib/forms/routebook";
import { idParam, notFoundPage } from "~/lib/route-params";
import type { Route } from "./+types/products.$productId.edit";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.product.name ?? "Product"} · Patina` }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebookEdit");
  const product = await productForEdit(scope, idParam(params, "productId", "product"));
  if (!product) notFoundPage("No product with that number in your company.");
  return { product };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const productId = idParam(params, "productId", "product");
  const parsed = parseProductForm(formObject(await request.formData()));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  const result = await saveProduct(scope, productId, parsed.value);
  if (!result.ok) return refusedAnswer(result);
  throw redirect("/products");
}

export default function EditProduct({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title={`Product: ${loaderData.product.name}`}>
      <ProductForm product={loaderData.product} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
