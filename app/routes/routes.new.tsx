import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { companyTechnicians } from "~/.server/routebook/queries/routes";
import { refusedAnswer } from "~/.server/command-result";
import { saveRoute } from "~/.server/routebook/commands/routes";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { RouteForm } from "~/components/routebook/route-form";
import { formObject } from "~/lib/forms/fields";
import { parseRouteForm } from "~/lib/forms/routebook";
import type { Route } from "./+types/routes.new";

export const meta: Route.MetaFunction = () => [{ title: "New route · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebookEdit");
  return { technicians: await companyTechnicians(scope) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const parsed = parseRouteForm(formObject(await request.formData(), ["serviceWeekdays", "technicianIds"]));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  // A new route starts in use; the form offers archiving only once it exists.
  const result = await saveRoute(scope, null, { ...parsed.value, active: true });
  if (!result.ok) return refusedAnswer(result);
  throw redirect("/routes");
}

export default function NewRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title="New route">
      <RouteForm route={null} technicians={loaderData.technicians} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
