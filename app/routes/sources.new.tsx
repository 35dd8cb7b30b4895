import { redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { refusedAnswer } from "~/.server/command-result";
import { saveSource } from "~/.server/routebook/commands/sources";
import { EntryFormPage } from "~/components/routebook/entry-form";
import { SourceForm } from "~/components/routebook/simple-forms";
import { formObject } from "~/lib/forms/fields";
import { parseSourceForm } from "~/lib/forms/routebook";
import type { Route } from "./+types/sources.new";

export const meta: Route.MetaFunction = () => [{ title: "New fill source · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  requireArea(context, "routebookEdit");
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const parsed = parseSourceForm(formObject(await request.formData()));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  // A new source starts in use; the form offers archiving only once it exists.
  const result = await saveSource(scope, null, { ...parsed.value, active: true });
  if (!result.ok) return refusedAnswer(result);
  throw redirect(`/sources/${result.id}`);
}

export default function NewSource({ actionData }: Route.ComponentProps) {
  return (
    <EntryFormPage title="New fill source">
      <SourceForm source={null} answer={actionData} />
    </EntryFormPage>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
