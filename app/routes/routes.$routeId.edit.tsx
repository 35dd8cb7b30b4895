import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { companyTechnicians, routeForEdit } from "~/.server/routebook/queries/routes";
import { refusedAnswer } from "~/.server/command-result";
import { saveRoute } from "~/.server/routebook/commands/routes";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { RouteForm } from "~/components/routebook/route-form";
import { formObject } from "~/lib/forms/fields";
import { parseRouteForm } from "~/lib/forms/routebook";
import { idParam, notFoundPage } from "~/lib/route-params";
import type { Route } from "./+types/routes.$routeId.edit";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.route.name ?? "Route"} · Patina` }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebookEdit");
  const routeId = idParam(params, "routeId", "route");
  const [route, technicians] = await Promise.all([routeForEdit(scope, routeId), companyTechnicians(scope)]);
  if (!route) notFoundPage("No route with that number in your company.");
  return { route, technicians };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const routeId = idParam(params, "routeId", "route");
  const parsed = parseRouteForm(formObject(await request.formData(), ["serviceWeekdays", "technicianIds"]));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  const result = await saveRoute(scope, routeId, parsed.value);
  if (!result.ok) return refusedAnswer(result);
  throw redirect("/routes");
}

export default function EditRoute({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title={`Route: ${loaderData.route.name}`}>
      <RouteForm route={loaderData.route} technicians={loaderData.technicians} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
