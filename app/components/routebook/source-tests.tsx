import { Form } from "react-router";
import { SaveFooter, TextField } from "~/components/form-controls";
import { ReadingTable } from "~/components/reading-table";
import type { EntryAnswer } from "~/components/routebook/entry-form";
import { formatMgL } from "~/lib/format";
import type { StoredMetals } from "@analysis/metals/names";

type SourceTest = StoredMetals & { id: number; sampledOn: string; note: string | null };

export function SourceTestTable({ tests }: { tests: SourceTest[] }) {
  if (tests.length === 0) return <p className="text-muted">No tests of this water yet. A lab or kit test of the fill water shows whether it brings metals in.</p>;
  return (
    <ReadingTable caption="Tests of the fill water, metals in mg/L" headings={["Sampled", "Copper", "Iron", "Manganese", "Note"]}>
      {tests.map((t) => (
        <tr key={t.id}>
          <td className="px-3 py-2 whitespace-nowrap">{t.sampledOn}</td>
          <td className="px-3 py-2">{formatMgL(t.copper, t.copperBelowDetection)}</td>
          <td className="px-3 py-2">{formatMgL(t.iron, t.ironBelowDetection)}</td>
          <td className="px-3 py-2">{formatMgL(t.manganese, t.manganeseBelowDetection)}</td>
          <td className="px-3 py-2">{t.note ?? ""}</td>
        </tr>
      ))}
    </ReadingTable>
  );
}

export function SourceTestForm({ today, answer }: { today: string; answer: EntryAnswer }) {
  const errors = answer?.fieldErrors;
  return (
    <Form method="post" className="space-y-3 rounded-xl border border-line bg-white p-4" noValidate>
      <h3 className="font-semibold">Record a test of this water</h3>
      <div className="grid gap-3 sm:grid-cols-4">
        <TextField name="sampledOn" label="Sampled on" type="date" defaultValue={today} max={today} errors={errors} />
        <TextField name="copper" label="Copper (mg/L)" inputMode="decimal" placeholder="e.g. 0.12 or <0.05" errors={errors} />
        <TextField name="iron" label="Iron (mg/L)" inputMode="decimal" errors={errors} />
        <TextField name="manganese" label="Manganese (mg/L)" inputMode="decimal" errors={errors} />
      </div>
      <TextField name="note" label="Note (lab, method)" maxLength={2000} errors={errors} />
      <SaveFooter formError={answer?.formError}>Save source test</SaveFooter>
    </Form>
  );
}
