import { Form, useNavigation } from "react-router";
import { ArchiveToggle } from "~/components/routebook/archive-toggle";
import { ChoiceGroup, FormProblem, SubmitButton, TextField } from "~/components/form-controls";
import type { FieldErrors } from "~/lib/forms/fields";
import { WEEKDAY_OPTIONS } from "~/lib/weekdays";

export function RouteForm({
  route,
  technicians,
  answer,
}: {
  route: { name: string; serviceWeekdays: string; technicianIds: string[]; active: boolean } | null;
  technicians: Array<{ userId: string; name: string }>;
  answer: { fieldErrors: FieldErrors; formError: string | null } | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const errors = answer?.fieldErrors;
  return (
    <Form method="post" className="max-w-xl space-y-4 rounded-xl border border-line bg-white p-4" noValidate>
      <TextField name="name" label="Route name" defaultValue={route?.name} errors={errors} required maxLength={120} />
      <ChoiceGroup
        name="serviceWeekdays"
        legend="Service days"
        type="checkbox"
        options={WEEKDAY_OPTIONS}
        checked={route?.serviceWeekdays.split(",") ?? []}
        errors={errors}
      />
      {technicians.length === 0 ? (
        <p className="text-sm text-muted">No technicians in the company yet; add them on the Team page.</p>
      ) : (
        <ChoiceGroup
          name="technicianIds"
          legend="Technicians"
          type="checkbox"
          options={technicians.map((t) => ({ value: t.userId, label: t.name }))}
          checked={route?.technicianIds ?? []}
          errors={errors}
        />
      )}
      {route ? (
        <ArchiveToggle active={route.active} explanation="untick to archive: its pools keep their history, but the route leaves the day's list and the pickers" />
      ) : null}
      <FormProblem message={answer?.formError} />
      <SubmitButton busy={busy} busyText="Saving…">
        Save route
      </SubmitButton>
    </Form>
  );
}
