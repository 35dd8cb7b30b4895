import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { routeOptions } from "~/.server/routebook/queries/routes";
import { sourceOptions } from "~/.server/routebook/queries/sources";
import { refusedAnswer } from "~/.server/command-result";
import { savePool } from "~/.server/routebook/commands/pools";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { PoolForm } from "~/components/routebook/pool-form";
import { formObject } from "~/lib/forms/fields";
import { parsePoolForm } from "~/lib/forms/routebook";
import type { Route } from "./+types/pools.new";

export const meta: Route.MetaFunction = () => [{ title: "New pool · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebookEdit");
  const [routes, sources, prefs] = await Promise.all([routeOptions(scope), sourceOptions(scope), companyPreferences(scope)]);
  return { routes, sources, units: prefs.units };
}

export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const { units } = await companyPreferences(scope);
  const parsed = parsePoolForm(formObject(await request.formData()), units);
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  const result = await savePool(scope, null, parsed.value);
  if (!result.ok) return refusedAnswer(result);
  throw redirect(`/pools/${result.id}`);
}

export default function NewPool({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title="New pool">
      <PoolForm pool={null} units={loaderData.units} routes={loaderData.routes} sources={loaderData.sources} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
