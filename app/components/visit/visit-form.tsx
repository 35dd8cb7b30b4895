import { type ChangeEvent, type InputHTMLAttributes, useEffect, useRef, useState, useSyncExternalStore } from "react";
import { Form, useNavigation } from "react-router";
import { classifyBalance, type BalanceBand } from "@analysis/chemistry/saturation";
import type { MetalThresholds } from "@analysis/metals/reading";
import { CautionNote } from "~/components/caution-note";
import { FormProblem, OptionList, SubmitButton } from "~/components/form-controls";
import type { FieldErrors } from "~/lib/forms/fields";
import { NUMERIC_ANALYTES, TREATMENT_FIELDS, type TypedVisit, VISIT_METALS } from "~/lib/forms/visit";
import { formatMoney } from "~/lib/format";
import { KEPT_FIELDS } from "~/lib/offline/kept-visits";
import { liveVisit, type DosingPool, type LiveProduct, type TypedLine } from "~/lib/forms/visit-live";
import { ENDPOINT_LABELS, PAD_TINT_LABELS, STAIN_COLOUR_LABELS, STAIN_LABELS } from "~/lib/labels";
import { DEFAULT_ANALYTE_RANGES } from "@analysis/chemistry/ranges";
import { LabelAmount } from "./label-amount";

type Product = LiveProduct & { name: string };
type Snapshot = { values: Record<string, string>; lines: TypedLine[] };

export type VisitAnswer = { fieldErrors: FieldErrors; formError: string | null; values?: TypedVisit };

/** What the phone keeps with a visit it could not send yet (app/lib/offline/kept-visits.ts); the server ignores these. */
export type KeptAs = { poolLabel: string; memberId: string; takenAt?: string };

const bigInput = "mt-1 block w-full rounded-lg border border-line bg-white px-3 py-3 text-lg aria-[invalid=true]:border-alert";

/** The error key of a treatment line's field, as the server names it. */
const TREATMENT_ERROR_KEY: Record<(typeof TREATMENT_FIELDS)[number], string> = {
  treatmentProduct: "product",
  treatmentAmount: "amount",
  treatmentUnit: "unit",
};

function snapshotOf(typed: TypedVisit): Snapshot {
  const values: Record<string, string> = {};
  for (const [name, value] of Object.entries(typed)) {
    if (typeof value === "string") values[name] = value;
  }
  const column = (name: string) => {
    const v = typed[name];
    return Array.isArray(v) ? v : typeof v === "string" ? [v] : [];
  };
  const products = column("treatmentProduct");
  const amounts = column("treatmentAmount");
  const units = column("treatmentUnit");
  const count = Math.max(products.length, amounts.length, units.length);
  const lines = Array.from({ length: count }, (_, i) => ({ productId: products[i] ?? "", amount: amounts[i] ?? "", unit: units[i] ?? "" }));
  return { values, lines };
}

/** What the form holds right now, straight from the page (typed before or after the script loaded). */
function readForm(form: HTMLFormElement): Snapshot {
  const typed: TypedVisit = {};
  const data = new FormData(form);
  for (const name of new Set(data.keys())) {
    const all = data.getAll(name).map((v) => (typeof v === "string" ? v : ""));
    typed[name] = (TREATMENT_FIELDS as readonly string[]).includes(name) ? all : (all.at(-1) ?? "");
  }
  return snapshotOf(typed);
}

/** Ties an input to its error message: marked invalid, and described by the message's element. */
function errorProps(message: string | undefined, id: string) {
  return { "aria-invalid": Boolean(message), "aria-describedby": message ? id : undefined };
}

function FieldError({ id, message }: { id: string; message: string | undefined }) {
  return message ? (
    <span id={id} className="mt-1 block text-sm text-alert">
      {message}
    </span>
  ) : null;
}

/** A text field of a treatment line; its error is shown under the line, beside its neighbour's. */
function LineInput({
  line,
  label,
  error,
  errorId,
  ...input
}: { line: number; label: string; error: string | undefined; errorId: string } & InputHTMLAttributes<HTMLInputElement>) {
  return (
    <label className="block">
      <span className="text-sm font-medium">{label}</span>
      <input data-line={line} className={bigInput} {...errorProps(error, errorId)} {...input} />
    </label>
  );
}

function Choice({
  name,
  legend,
  labels,
  initial,
  clearable,
  onClear,
  error,
}: {
  name: string;
  legend: string;
  labels: Record<string, string>;
  initial: string;
  clearable: boolean;
  onClear: () => void;
  error: string | undefined;
}) {
  return (
    <fieldset aria-describedby={error ? `${name}-error` : undefined}>
      <legend className="text-sm font-medium">{legend}</legend>
      <div className="mt-1 flex flex-wrap gap-2">
        {Object.entries(labels).map(([v, label]) => (
          <label
            key={v}
            className="flex min-h-12 cursor-pointer items-center gap-2 rounded-lg border border-line bg-white px-3 has-checked:border-verdigris-700 has-checked:bg-verdigris-50"
          >
            <input type="radio" name={name} value={v} defaultChecked={initial === v} className="size-5 accent-verdigris-700" />
            {label}
          </label>
        ))}
        {clearable ? (
          <button type="button" onClick={onClear} className="px-2 text-sm text-muted underline">
            clear
          </button>
        ) : null}
      </div>
      <FieldError id={`${name}-error`} message={error} />
    </fieldset>
  );
}

/** Whether the page is hydrated never changes after it is: nothing to subscribe to. */
const neverChanges = () => () => {};

/**
 * The visit form, built for a phone in the field. Every input keeps its own
 * value (uncontrolled), so it works as a plain form post before the script
 * arrives and nothing typed is lost when it does; the script then reads the
 * form on each change to show the saturation index and warnings at once.
 * The server checks everything again and answers with an error per field.
 */
export function VisitForm({
  submissionKey,
  products,
  thresholds,
  balanceBand,
  temperatureUnit,
  dosing,
  answer,
  keptAs,
}: {
  submissionKey: string;
  keptAs?: KeptAs;
  products: Product[];
  /** The pool's recorded volume and the company's units and currency, for the label amounts and costs. */
  dosing: DosingPool & { currency: string };
  thresholds: MetalThresholds;
  balanceBand: BalanceBand;
  temperatureUnit: "C" | "F";
  answer: VisitAnswer | undefined;
}) {
  const busy = useNavigation().state !== "idle";
  const formRef = useRef<HTMLFormElement>(null);
  // What the server rendered into the inputs: the refused post's own values, or an empty form.
  const [initial] = useState<Snapshot>(() => snapshotOf({ temperatureUnit, ...answer?.values }));
  const [current, setCurrent] = useState<Snapshot>(initial);
  const [lineCount, setLineCount] = useState(Math.max(1, initial.lines.length));
  // false in the server's HTML and while hydrating, true once the script runs.
  const hydrated = useSyncExternalStore(neverChanges, () => true, () => false);
  // Fields changed since the server last answered: its error for them may no longer hold.
  const [changed, setChanged] = useState<ReadonlySet<string>>(new Set());

  const refresh = () => {
    if (formRef.current) setCurrent(readForm(formRef.current));
  };

  // Picks up whatever was typed while the script was loading (the inputs are the source).
  useEffect(() => {
    if (formRef.current) setCurrent(readForm(formRef.current));
  }, []);

  // A new answer from the server: its errors hold again for every field.
  const [answered, setAnswered] = useState(answer);
  if (answered !== answer) {
    setAnswered(answer);
    setChanged(new Set());
  }

  const { values, lines } = current;
  const { readings, errors: liveErrors, balance, warnings, askForMetals, acidGiven, phHigh, hasStain, costs, labelAmounts, sequestrantNote } =
    liveVisit(values, lines, products, thresholds, dosing);
  const labelShown = labelAmounts.some((a) => a?.kind === "amounts");
  const errorFor = (key: string): string | undefined => liveErrors[key] ?? (changed.has(key) ? undefined : answer?.fieldErrors[key]);
  const productById = new Map(products.map((p) => [String(p.id), p]));
  const productOptions = products.map((p) => ({ value: String(p.id), label: p.name }));

  const onChange = (event: ChangeEvent<HTMLFormElement>) => {
    const target = event.target as unknown as HTMLInputElement | HTMLSelectElement;
    const line = target.dataset.line;
    if (target.name === "treatmentProduct" && line !== undefined) {
      // A newly chosen product brings its own dose unit, which is also the unit it is costed in.
      const unit = formRef.current?.querySelector<HTMLInputElement>(`input[name="treatmentUnit"][data-line="${line}"]`);
      if (unit) unit.value = productById.get(target.value)?.doseUnit ?? "";
    }
    const field = target.name as (typeof TREATMENT_FIELDS)[number];
    const key = line !== undefined && field in TREATMENT_ERROR_KEY ? `treatments.${line}.${TREATMENT_ERROR_KEY[field]}` : target.name;
    if (key) setChanged((all) => new Set(all).add(key));
    refresh();
  };

  const clearChoice = (name: string) => () => {
    formRef.current?.querySelectorAll<HTMLInputElement>(`input[name="${name}"]`).forEach((radio) => {
      radio.checked = false;
    });
    setChanged((all) => new Set(all).add(name));
    refresh();
  };

  const choice = (name: string, legend: string, labels: Record<string, string>) => (
    <Choice
      name={name}
      legend={legend}
      labels={labels}
      initial={initial.values[name] ?? ""}
      clearable={hydrated && Boolean(values[name])}
      onClear={clearChoice(name)}
      error={errorFor(name)}
    />
  );

  const numberInput = (name: string, label: string, unit: string) => {
    const error = errorFor(name);
    return (
      <label key={name} className="block">
        <span className="text-sm font-medium">
          {label}
          {unit ? <span className="font-normal text-muted"> ({unit})</span> : null}
        </span>
        <input
          name={name}
          inputMode="decimal"
          autoComplete="off"
          defaultValue={initial.values[name] ?? ""}
          {...errorProps(error, `${name}-error`)}
          className={bigInput}
        />
        <FieldError id={`${name}-error`} message={error} />
      </label>
    );
  };

  // A refused form keeps its key (nothing was stored under it), unless the key itself was the problem.
  const typedKey = answer?.values?.submissionKey;
  const keptKey = typeof typedKey === "string" && !answer?.fieldErrors.submissionKey ? typedKey : null;
  const unplacedErrors = ["submissionKey", "form"].map((key) => answer?.fieldErrors[key]).filter(Boolean);

  return (
    <Form ref={formRef} method="post" onChange={onChange} className="space-y-6 pb-28" noValidate data-live={hydrated ? "on" : "off"}>
      <input type="hidden" name="submissionKey" value={keptKey ?? submissionKey} />
      {keptAs ? (
        <>
          <input type="hidden" name={KEPT_FIELDS.poolLabel} value={keptAs.poolLabel} />
          <input type="hidden" name={KEPT_FIELDS.memberId} value={keptAs.memberId} />
          {keptAs.takenAt ? <input type="hidden" name={KEPT_FIELDS.takenAt} value={keptAs.takenAt} /> : null}
        </>
      ) : null}
      <section aria-labelledby="readings" className="space-y-3">
        <h2 id="readings" className="text-lg font-semibold">Readings</h2>
        <p className="text-sm text-muted">Fill in what you tested; leave the rest empty.</p>
        <div className="grid grid-cols-2 gap-3">
          {NUMERIC_ANALYTES.map((a) => numberInput(a.key, a.label, a.unit))}
          <div className="col-span-2 grid grid-cols-[1fr_auto] items-end gap-2">
            {numberInput("temperature", "Water temperature", `°${(hydrated ? values : initial.values).temperatureUnit === "F" ? "F" : "C"}`)}
            <fieldset className="flex overflow-hidden rounded-lg border border-line">
              <legend className="sr-only">Temperature unit</legend>
              {(["C", "F"] as const).map((u) => (
                <label key={u} className="flex min-h-12 cursor-pointer items-center px-4 has-checked:bg-verdigris-700 has-checked:text-white">
                  <input type="radio" name="temperatureUnit" value={u} defaultChecked={initial.values.temperatureUnit === u} className="sr-only" />
                  °{u}
                </label>
              ))}
            </fieldset>
          </div>
        </div>
        <h3 className="pt-2 font-semibold">Metals</h3>
        <p className="text-sm text-muted">Type “&lt;0.05” for a result below the kit's detection limit.</p>
        <div className="grid grid-cols-3 gap-3">{VISIT_METALS.map((m) => numberInput(m.key, m.label, "mg/L"))}</div>
      </section>

      <output aria-live="polite" className="block rounded-xl border border-line bg-white p-4">
        {balance.ok ? (
          <>
            <span className="block text-sm text-muted">Saturation index (pool-code factor table)</span>
            <span className="text-2xl font-semibold tabular-nums">{balance.index.toFixed(2)}</span>{" "}
            <span className="font-medium">{classifyBalance(balance.index, balanceBand)}</span>
            {balance.notes.length > 0 ? <span className="block text-xs text-muted">{balance.notes.join("; ")}</span> : null}
          </>
        ) : (
          <span className="text-sm text-muted">
            Saturation index: enter pH, temperature, calcium hardness and alkalinity to see it.
          </span>
        )}
      </output>

      {warnings.length > 0 ? (
        <div role="status" className="space-y-1 rounded-xl border border-watch bg-yellow-50 p-4 text-sm">
          <p className="font-semibold">Worth a second look (you can still save)</p>
          <ul className="list-disc pl-5">
            {warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </div>
      ) : null}

      <section aria-labelledby="observations" className="space-y-4">
        <h2 id="observations" className="text-lg font-semibold">What you saw</h2>
        {choice("hardnessEndpoint", "Hardness test endpoint", ENDPOINT_LABELS)}
        {askForMetals ? (
          <p role="status" className="rounded-lg border border-calm bg-blue-50 p-3 text-sm">
            A blurred endpoint often means dissolved metals. Please test copper, iron and manganese now if you can; the pool
            will be marked “metal suspected” until a metal reading is logged.
          </p>
        ) : null}
        {choice("stain", "Visible stain", STAIN_LABELS)}
        {/* Shown until the script runs, so a colour can be given without it; only kept with a stain. */}
        <div hidden={hydrated && !hasStain}>{choice("stainColour", "Stain colour (only with a stain)", STAIN_COLOUR_LABELS)}</div>
        {choice("padTint", "Metal-collector pad", PAD_TINT_LABELS)}
        <label className="block">
          <span className="text-sm font-medium">Note</span>
          <textarea
            name="note"
            rows={2}
            maxLength={2000}
            defaultValue={initial.values.note ?? ""}
            className={bigInput}
            {...errorProps(errorFor("note"), "note-error")}
          />
          <FieldError id="note-error" message={errorFor("note")} />
        </label>
      </section>

      <section aria-labelledby="treatments" className="space-y-3">
        <h2 id="treatments" className="text-lg font-semibold">Treatments given</h2>
        {Array.from({ length: lineCount }, (_, i) => {
          const start = initial.lines[i] ?? { productId: "", amount: "", unit: "" };
          const cost = costs[i] ?? null;
          const productError = errorFor(`treatments.${i}.product`);
          const amountError = errorFor(`treatments.${i}.amount`);
          const unitError = errorFor(`treatments.${i}.unit`);
          return (
            <div key={i} className="grid grid-cols-2 gap-2 rounded-xl border border-line bg-white p-3">
              <label className="col-span-2 block">
                <span className="text-sm font-medium">Product {i + 1}</span>
                <select
                  name="treatmentProduct"
                  data-line={i}
                  defaultValue={start.productId}
                  className={bigInput}
                  {...errorProps(productError, `treatment-${i}-product-error`)}
                >
                  <OptionList options={productOptions} blank="None" />
                </select>
                <FieldError id={`treatment-${i}-product-error`} message={productError} />
              </label>
              <LineInput line={i} label="Amount" name="treatmentAmount" inputMode="decimal" autoComplete="off" defaultValue={start.amount} error={amountError} errorId={`treatment-${i}-amount-error`} />
              <LineInput line={i} label="Unit" name="treatmentUnit" defaultValue={start.unit} maxLength={16} error={unitError} errorId={`treatment-${i}-unit-error`} />
              <span className="col-span-2">
                <FieldError id={`treatment-${i}-amount-error`} message={amountError} />
                <FieldError id={`treatment-${i}-unit-error`} message={unitError} />
              </span>
              {cost !== null ? <span className="col-span-2 text-sm text-muted">Cost {formatMoney(cost, dosing.currency)}</span> : null}
              <LabelAmount answer={labelAmounts[i] ?? null} volumeLitres={dosing.volumeLitres} units={dosing.units} />
            </div>
          );
        })}
        {hydrated ? (
          <button
            type="button"
            onClick={() => setLineCount((n) => n + 1)}
            className="rounded-lg border border-line bg-white px-4 py-3 font-medium"
          >
            Add another treatment
          </button>
        ) : null}
        {sequestrantNote ? (
          <p role="status" className="rounded-lg border border-calm bg-blue-50 p-3 text-sm">
            {sequestrantNote}
          </p>
        ) : null}
        {labelShown ? <CautionNote topics={["dose"]} /> : null}
        {acidGiven || phHigh ? (
          <CautionNote topics={["acid"]}>
            {phHigh ? `pH ${readings.ph} is above ${DEFAULT_ANALYTE_RANGES.ph.high}; a pH decreaser is the usual step.` : "A pH decreaser is an acid."}
          </CautionNote>
        ) : null}
      </section>

      <FormProblem message={answer?.formError} />
      {unplacedErrors.map((message) => (
        <FormProblem key={message} message={message} />
      ))}
      <div className="fixed inset-x-0 bottom-0 border-t border-line bg-paper/95 p-3 backdrop-blur">
        <SubmitButton busy={busy} busyText="Saving…" className="mx-auto block w-full max-w-xl rounded-xl bg-verdigris-700 px-4 py-4 text-lg font-semibold text-white disabled:opacity-60">
          Save visit
        </SubmitButton>
      </div>
    </Form>
  );
}
