import { ArchiveToggle } from "~/components/routebook/archive-toggle";
import { type EntryAnswer, EntryForm } from "~/components/routebook/entry-form";
import { ChoiceGroup, TextField } from "~/components/form-controls";
import { WEEKDAY_OPTIONS } from "~/lib/weekdays";

export function RouteForm({
  route,
  technicians,
  answer,
}: {
  route: { name: string; serviceWeekdays: string; technicianIds: string[]; active: boolean } | null;
  technicians: Array<{ userId: string; name: string }>;
  answer: EntryAnswer;
}) {
  const errors = answer?.fieldErrors;
  return (
    <EntryForm answer={answer} save="Save route">
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
    </EntryForm>
  );
}
