import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { refusedAnswer } from "~/.server/command-result";
import { saveProduct } from "~/.server/routebook/commands/products";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { ProductForm } from "~/components/routebook/simple-forms";
import { formObject } from "~/lib/forms/fields";
import { parseProductForm } from "~/lib/forms/routebook";
import type { Route } from "./+types/products.new";

export const meta: Route.MetaFunction = () => [{ title: "New product · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  requireArea(context, "routebookEdit");
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const parsed = parseProductForm(formObject(await request.formData()));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  const result = await saveProduct(scope, null, parsed.value);
  if (!result.ok) return refusedAnswer(result);
  throw redirect("/products");
}

export default function NewProduct({ actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title="New product">
      <ProductForm product={null} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
