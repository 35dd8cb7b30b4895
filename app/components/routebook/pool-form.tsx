import { useState } from "react";
import { isVolumeError, poolVolume } from "@analysis/units/volume";
import { options, SelectField, TextField } from "~/components/form-controls";
import { type EntryAnswer, EntryForm } from "~/components/routebook/entry-form";
import { type ArchivableOption, pickerOptions } from "~/lib/archived";
import type { FieldErrors } from "~/lib/forms/fields";
import { shapeFromForm } from "~/lib/forms/routebook";
import { SANITISER_LABELS, SURFACE_LABELS } from "~/lib/labels";
import { type UnitSystem, VOLUME_UNIT, volumeInUnits } from "~/lib/units";

type PoolValues = {
  accountCode: string;
  customerName: string;
  customerPhone: string | null;
  customerEmail: string | null;
  street: string;
  neighbourhood: string | null;
  postalCode: string | null;
  routeId: number | null;
  fillSourceId: number | null;
  surface: string | null;
  sanitiser: string | null;
  volumeLitres: number | null;
  active: boolean;
};

const SHAPE_FIELDS: Record<string, Array<{ name: string; label: string }>> = {
  rectangle: [
    { name: "length", label: "Length" },
    { name: "width", label: "Width" },
  ],
  oval: [
    { name: "length", label: "Length (longest)" },
    { name: "width", label: "Width (shortest)" },
  ],
  round: [{ name: "diameter", label: "Diameter" }],
  kidney: [
    { name: "length", label: "Length" },
    { name: "widthA", label: "Width at the wide end" },
    { name: "widthB", label: "Width at the narrow end" },
  ],
};

export function PoolForm({
  pool,
  units,
  routes,
  sources,
  answer,
}: {
  pool: PoolValues | null;
  units: UnitSystem;
  routes: ArchivableOption[];
  sources: ArchivableOption[];
  answer: EntryAnswer;
}) {
  const errors = answer?.fieldErrors;
  const [mode, setMode] = useState<"direct" | "shape">("direct");
  const [shapeValues, setShapeValues] = useState<Record<string, string>>({
    shape: "rectangle",
    lengthUnit: units === "us" ? "ft" : "m",
  });
  const shapeErrors: FieldErrors = {};
  const shape = mode === "shape" ? shapeFromForm(shapeValues, shapeErrors) : null;
  const computed = shape ? poolVolume(shape) : null;
  const setShape = (name: string) => (event: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) =>
    setShapeValues((v) => ({ ...v, [name]: event.target.value }));
  const lengthUnit = shapeValues.lengthUnit === "m" ? "m" : "ft";

  return (
    <EntryForm answer={answer} save="Save pool" wide>
      <input type="hidden" name="intent" value="save-pool" />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField name="accountCode" label="Account code" defaultValue={pool?.accountCode} errors={errors} maxLength={40} />
        <TextField name="customerName" label="Customer name" defaultValue={pool?.customerName} errors={errors} maxLength={200} />
        <TextField name="customerPhone" label="Customer phone" type="tel" defaultValue={pool?.customerPhone ?? ""} errors={errors} maxLength={40} />
        <TextField name="customerEmail" label="Customer e-mail" type="email" defaultValue={pool?.customerEmail ?? ""} errors={errors} />
        <TextField name="street" label="Street address" defaultValue={pool?.street} errors={errors} className="sm:col-span-2" />
        <TextField name="neighbourhood" label="Neighbourhood" defaultValue={pool?.neighbourhood ?? ""} errors={errors} />
        <TextField name="postalCode" label="Postal code" defaultValue={pool?.postalCode ?? ""} errors={errors} />
        <SelectField name="routeId" label="Route" defaultValue={pool?.routeId ?? ""} placeholder="No route" options={pickerOptions(routes, pool?.routeId)} errors={errors} />
        <SelectField name="fillSourceId" label="Fill source" defaultValue={pool?.fillSourceId ?? ""} placeholder="Unknown" options={pickerOptions(sources, pool?.fillSourceId)} errors={errors} />
        <SelectField name="surface" label="Surface finish" defaultValue={pool?.surface ?? ""} placeholder="Unknown" options={options(SURFACE_LABELS)} errors={errors} />
        <SelectField name="sanitiser" label="Sanitiser system" defaultValue={pool?.sanitiser ?? ""} placeholder="Unknown" options={options(SANITISER_LABELS)} errors={errors} />
      </div>

      <fieldset className="space-y-3 rounded-lg border border-line p-3">
        <legend className="px-1 text-sm font-medium">Volume</legend>
        <div className="flex flex-wrap gap-2">
          {(["direct", "shape"] as const).map((m) => (
            <label key={m} className="flex min-h-11 items-center gap-2 rounded-lg border border-line px-3 has-checked:border-verdigris-700 has-checked:bg-verdigris-50">
              <input type="radio" name="volumeMode" value={m} checked={mode === m} onChange={() => setMode(m)} className="size-5 accent-verdigris-700" />
              {m === "direct" ? `Enter in ${VOLUME_UNIT[units] === "gal" ? "gallons" : "litres"}` : "Work out from shape and size"}
            </label>
          ))}
        </div>
        {mode === "direct" ? (
          <TextField
            name="volume"
            label={`Volume (${VOLUME_UNIT[units]})`}
            inputMode="decimal"
            defaultValue={pool?.volumeLitres ? volumeInUnits(pool.volumeLitres, units) : ""}
            errors={errors}
          />
        ) : (
          <div className="grid gap-3 sm:grid-cols-3">
            <SelectField name="shape" label="Shape" value={shapeValues.shape} onChange={setShape("shape")} options={[
              { value: "rectangle", label: "Rectangle" },
              { value: "round", label: "Round" },
              { value: "oval", label: "Oval" },
              { value: "kidney", label: "Kidney" },
            ]} errors={errors} />
            <SelectField name="lengthUnit" label="Measured in" value={lengthUnit} onChange={setShape("lengthUnit")} options={[
              { value: "ft", label: "feet" },
              { value: "m", label: "metres" },
            ]} />
            {[...(SHAPE_FIELDS[shapeValues.shape ?? "rectangle"] ?? []), { name: "shallowDepth", label: "Shallow-end depth" }, { name: "deepDepth", label: "Deep-end depth" }].map((f) => (
              <TextField key={f.name} name={f.name} label={`${f.label} (${lengthUnit})`} inputMode="decimal" value={shapeValues[f.name] ?? ""} onChange={setShape(f.name)} errors={errors} />
            ))}
            <p className="text-sm sm:col-span-3" aria-live="polite">
              {computed && !isVolumeError(computed)
                ? `About ${new Intl.NumberFormat("en").format(volumeInUnits(computed.litres, units))} ${VOLUME_UNIT[units]} (${computed.method}).`
                : "Enter every measurement to see the volume."}
            </p>
          </div>
        )}
      </fieldset>
      <label className="flex items-center gap-2">
        <input type="checkbox" name="active" defaultChecked={pool?.active ?? true} className="size-5 accent-verdigris-700" />
        <span>In service (untick to archive; its history stays)</span>
      </label>
    </EntryForm>
  );
}
