import { ArchiveToggle } from "~/components/routebook/archive-toggle";
import { type EntryAnswer, EntryForm } from "~/components/routebook/entry-form";
import { options, SelectField, TextAreaField, TextField } from "~/components/form-controls";
import { DOSE_BASIS_LABELS, PRODUCT_CATEGORY_LABELS, SOURCE_KIND_LABELS } from "~/lib/labels";

export function SourceForm({
  source,
  answer,
}: {
  source: { name: string; kind: string; notes: string | null; active: boolean } | null;
  answer: EntryAnswer;
}) {
  const errors = answer?.fieldErrors;
  return (
    <EntryForm answer={answer} save="Save source">
      <TextField name="name" label="Source name" defaultValue={source?.name} errors={errors} required maxLength={160} />
      <SelectField name="kind" label="Kind" defaultValue={source?.kind ?? ""} placeholder="Choose…" options={options(SOURCE_KIND_LABELS)} errors={errors} />
      <TextAreaField name="notes" label="Notes" defaultValue={source?.notes ?? ""} errors={errors} maxLength={2000} />
      {source ? (
        <ArchiveToggle active={source.active} explanation="untick to archive: its tests and pools stay, but it leaves the pickers" />
      ) : null}
    </EntryForm>
  );
}

type ProductValues = {
  name: string;
  category: string;
  labelDose: number | null;
  maintenanceDose: number | null;
  doseUnit: string | null;
  doseBasis: string;
  unitCost: number | null;
  active: boolean;
};

export function ProductForm({ product, answer }: { product: ProductValues | null; answer: EntryAnswer }) {
  const errors = answer?.fieldErrors;
  return (
    <EntryForm answer={answer} save="Save product">
      <TextField name="name" label="Product name (your company's own)" defaultValue={product?.name} errors={errors} required maxLength={160} />
      <SelectField name="category" label="Category" defaultValue={product?.category ?? ""} placeholder="Choose…" options={options(PRODUCT_CATEGORY_LABELS)} errors={errors} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField name="labelDose" label="Label dose" inputMode="decimal" defaultValue={product?.labelDose ?? ""} errors={errors} hint="The label's starting dose." />
        <TextField name="maintenanceDose" label="Maintenance dose" inputMode="decimal" defaultValue={product?.maintenanceDose ?? ""} errors={errors} hint="The label's regular dose, if it gives one." />
        <TextField name="doseUnit" label="Dose unit" defaultValue={product?.doseUnit ?? ""} errors={errors} maxLength={16} hint="e.g. fl oz, lb, pad" />
        <SelectField name="doseBasis" label="Per" defaultValue={product?.doseBasis ?? "per_10k_gal"} options={options(DOSE_BASIS_LABELS)} errors={errors} />
      </div>
      <TextField name="unitCost" label="Cost of one dose unit" inputMode="decimal" defaultValue={product?.unitCost ?? ""} errors={errors} hint="Used to cost each treatment logged in this unit." />
      <label className="flex items-center gap-2">
        <input type="checkbox" name="active" defaultChecked={product?.active ?? true} className="size-5 accent-verdigris-700" />
        <span>In use (untick to archive; past treatments keep it)</span>
      </label>
    </EntryForm>
  );
}
