import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { sourceForEdit } from "~/.server/routebook/queries/sources";
import { refusedAnswer } from "~/.server/command-result";
import { saveSource } from "~/.server/routebook/commands/sources";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { SourceForm } from "~/components/routebook/simple-forms";
import { formObject } from "~/lib/forms/fields";
import { parseSourceForm } from "~/lib/forms/routebook";
import { idParam, notFoundPage } from "~/lib/route-params";
import type { Route } from "./+types/sources.$sourceId.edit";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.source.name ?? "Fill source"} · Patina` }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebookEdit");
  const source = await sourceForEdit(scope, idParam(params, "sourceId", "fill source"));
  if (!source) notFoundPage("No fill source with that number in your company.");
  return { source };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const sourceId = idParam(params, "sourceId", "fill source");
  const parsed = parseSourceForm(formObject(await request.formData()));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  const result = await saveSource(scope, sourceId, parsed.value);
  if (!result.ok) return refusedAnswer(result);
  throw redirect(`/sources/${sourceId}`);
}

export default function EditSource({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title={`Fill source: ${loaderData.source.name}`}>
      <SourceForm source={loaderData.source} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
