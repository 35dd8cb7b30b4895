import { Form, useNavigation } from "react-router";
import { CautionNote } from "~/components/caution-note";
import { options, SelectField, SubmitButton, TextField } from "~/components/form-controls";
import { ageBetween } from "~/lib/dates";
import type { FieldErrors } from "~/lib/forms/fields";
import { EQUIPMENT_KIND_LABELS, EXCHANGER_METAL_LABELS, labelOf } from "~/lib/labels";

export type EquipmentItem = {
  id: number;
  kind: string;
  exchangerMetal: string | null;
  description: string | null;
  installedOn: string | null;
  removedOn: string | null;
};

export function equipmentAge(item: EquipmentItem, today: string): string {
  if (!item.installedOn) return "age unknown";
  return ageBetween(item.installedOn, item.removedOn ?? today);
}

function EquipmentFields({ errors, prefix }: { errors?: FieldErrors; prefix: string }) {
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <SelectField name="kind" id={`${prefix}-kind`} label="Kind" placeholder="Choose…" options={options(EQUIPMENT_KIND_LABELS)} errors={errors} />
      <SelectField name="exchangerMetal" id={`${prefix}-metal`} label="Heat-exchanger metal" placeholder="Not applicable" options={options(EXCHANGER_METAL_LABELS)} errors={errors} />
      <TextField name="description" id={`${prefix}-description`} label="Description" maxLength={200} errors={errors} />
      <TextField name="installedOn" id={`${prefix}-installed`} label="Installed on" type="date" errors={errors} />
    </div>
  );
}

/** Equipment on one pool: current and past items with ages, and forms to fit, replace or remove. */
export function EquipmentPanel({
  items,
  today,
  answer,
}: {
  items: EquipmentItem[];
  today: string;
  answer: { intent?: string; fieldErrors: FieldErrors; formError: string | null } | undefined;
}) {
  const busy = useNavigation().state === "submitting";
  const current = items.filter((i) => !i.removedOn);
  const errorsFor = (intent: string) => (answer?.intent === intent ? answer.fieldErrors : undefined);
  return (
    <section aria-labelledby="equipment-heading" className="max-w-2xl space-y-4">
      <h2 id="equipment-heading" className="text-lg font-semibold">Equipment</h2>
      <CautionNote topics={["equipment"]} />
      {items.length === 0 ? <p className="text-muted">No equipment recorded on this pool.</p> : null}
      <ul className="space-y-3">
        {items.map((item) => (
          <li key={item.id} className="rounded-xl border border-line bg-white p-3 text-sm">
            <p className="font-medium">
              {labelOf(EQUIPMENT_KIND_LABELS, item.kind)}
              {item.exchangerMetal ? ` · ${labelOf(EXCHANGER_METAL_LABELS, item.exchangerMetal)} exchanger` : ""}
              {item.description ? ` · ${item.description}` : ""}
            </p>
            <p className="text-muted">
              Installed {item.installedOn ?? "on an unknown date"}
              {item.removedOn ? ` · removed ${item.removedOn}` : ""} · {equipmentAge(item, today)}
              {item.removedOn ? " in service" : " old today"}
            </p>
            {!item.removedOn ? (
              <details className="mt-2">
                <summary className="cursor-pointer font-medium text-verdigris-700">Replace or remove</summary>
                <Form method="post" className="mt-2 space-y-3" noValidate>
                  <input type="hidden" name="intent" value="replace-equipment" />
                  <input type="hidden" name="equipmentId" value={item.id} />
                  <p className="text-muted">The new item's install date becomes this one's removal date; this one stays on record.</p>
                  <EquipmentFields errors={errorsFor("replace-equipment")} prefix={`replace-${item.id}`} />
                  <SubmitButton busy={busy} busyText="Saving…">
                    Replace with this
                  </SubmitButton>
                </Form>
                <Form method="post" className="mt-3 flex flex-wrap items-end gap-2" noValidate>
                  <input type="hidden" name="intent" value="remove-equipment" />
                  <input type="hidden" name="equipmentId" value={item.id} />
                  <TextField name="removedOn" id={`remove-${item.id}`} label="Removed on" type="date" defaultValue={today} errors={errorsFor("remove-equipment")} />
                  <button type="submit" className="rounded-lg border border-line px-4 py-3 font-medium">
                    Mark removed
                  </button>
                </Form>
              </details>
            ) : null}
          </li>
        ))}
      </ul>
      <Form method="post" className="space-y-3 rounded-xl border border-line bg-white p-3" noValidate>
        <h3 className="font-semibold">Fit new equipment</h3>
        <input type="hidden" name="intent" value="add-equipment" />
        <EquipmentFields errors={errorsFor("add-equipment")} prefix="add" />
        {answer?.formError && answer.intent?.includes("equipment") ? (
          <p role="alert" className="text-sm text-alert">{answer.formError}</p>
        ) : null}
        <SubmitButton busy={busy} busyText="Saving…">
          Add equipment
        </SubmitButton>
      </Form>
      <p className="text-xs text-muted">{current.length} item(s) in service.</p>
    </section>
  );
}
