import type { ReactNode } from "react";
import { Form } from "react-router";
import { PageHeader } from "~/components/data-table";
import { SaveFooter } from "~/components/form-controls";
import type { FieldErrors } from "~/lib/forms/fields";

/** What a route book form's action answers when it refuses: an error per field, and one for the whole form. */
export type EntryAnswer = { fieldErrors: FieldErrors; formError: string | null } | undefined;

/** The form of one route book entry (pool, route, fill source, product): its fields, then the save footer. */
export function EntryForm({ answer, save, wide = false, children }: { answer: EntryAnswer; save: string; wide?: boolean; children: ReactNode }) {
  return (
    <Form method="post" className={`${wide ? "max-w-2xl" : "max-w-xl"} space-y-4 rounded-xl border border-line bg-white p-4`} noValidate>
      {children}
      <SaveFooter formError={answer?.formError}>{save}</SaveFooter>
    </Form>
  );
}

/** The page of a new entry or of an entry's edit: its title above its form. */
export function EntryFormPage({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div>
      <PageHeader title={title} />
      {children}
    </div>
  );
}
