import { useMemo, useState } from "react";
import { Form, useNavigation } from "react-router";
import { classifyBalance, saturationIndex, type BalanceBand } from "@analysis/chemistry/saturation";
import { metalStatus, type MetalThresholds } from "@analysis/metals/reading";
import { CautionNote } from "~/components/caution-note";
import { FormProblem } from "~/components/form-controls";
import type { FieldErrors } from "~/lib/forms/fields";
import {
  hasMetalReading,
  NUMERIC_ANALYTES,
  parseVisitReadings,
  PH_WARNING,
  VISIT_METALS,
} from "~/lib/forms/visit";
import { ENDPOINT_LABELS, PAD_TINT_LABELS, STAIN_COLOUR_LABELS, STAIN_LABELS } from "~/lib/labels";
import { DEFAULT_ANALYTE_RANGES } from "~/lib/ranges";

type Product = { id: number; name: string; category: string; doseUnit: string | null; unitCost: number | null };
type Line = { key: number; productId: string; amount: string; unit: string };

const bigInput = "mt-1 block w-full rounded-lg border border-line bg-white px-3 py-3 text-lg aria-[invalid=true]:border-alert";

function Choice({
  name,
  legend,
  labels,
  value,
  onChange,
}: {
  name: string;
  legend: string;
  labels: Record<string, string>;
  value: string;
  onChange: (value: string) => void;
}) {
  return (
    <fieldset>
      <legend className="text-sm font-medium">{legend}</legend>
      <div className="mt-1 flex flex-wrap gap-2">
        {Object.entries(labels).map(([v, label]) => (
          <label
            key={v}
            className="flex min-h-12 cursor-pointer items-center gap-2 rounded-lg border border-line bg-white px-3 has-checked:border-verdigris-700 has-checked:bg-verdigris-50"
          >
            <input
              type="radio"
              name={name}
              value={v}
              checked={value === v}
              onChange={() => onChange(v)}
              className="size-5 accent-verdigris-700"
            />
            {label}
          </label>
        ))}
        {value ? (
          <button type="button" onClick={() => onChange("")} className="px-2 text-sm text-muted underline">
            clear
          </button>
        ) : null}
      </div>
    </fieldset>
  );
}

/**
 * The visit form, built for a phone: large inputs with the numeric keypad,
 * readings checked as they are typed with the same code the server uses, the
 * saturation index as soon as it can be worked out, warnings that never block.
 */
export function VisitForm({
  submissionKey,
  products,
  thresholds,
  balanceBand,
  temperatureUnit,
  answer,
}: {
  submissionKey: string;
  products: Product[];
  thresholds: MetalThresholds;
  balanceBand: BalanceBand;
  temperatureUnit: "C" | "F";
  answer: { fieldErrors: FieldErrors; formError: string | null } | undefined;
}) {
  const busy = useNavigation().state !== "idle";
  const [values, setValues] = useState<Record<string, string>>({ temperatureUnit });
  const [lines, setLines] = useState<Line[]>([{ key: 0, productId: "", amount: "", unit: "" }]);
  const set = (name: string) => (value: string) => setValues((v) => ({ ...v, [name]: value }));

  const { readings, errors: liveErrors } = useMemo(() => parseVisitReadings(values), [values]);
  const errors: FieldErrors = { ...answer?.fieldErrors, ...liveErrors };
  const balance = saturationIndex({
    ph: readings.ph,
    temperatureC: readings.temperatureC,
    calciumHardness: readings.calciumHardness,
    totalAlkalinity: readings.totalAlkalinity,
    cyanuricAcid: readings.cyanuricAcid,
    tds: readings.tds,
    salt: readings.salt,
  });

  const warnings: string[] = [];
  if (readings.ph !== undefined && (readings.ph < PH_WARNING.low || readings.ph > PH_WARNING.high)) {
    warnings.push(`pH ${readings.ph} is outside ${PH_WARNING.low}–${PH_WARNING.high}: check the reading and the reagent.`);
  }
  for (const metal of VISIT_METALS) {
    const reading = readings[metal.key];
    if (reading && metalStatus(reading, thresholds[metal.key]) === "elevated") {
      warnings.push(`${metal.label} ${reading.value} mg/L is at or above the elevated level (${thresholds[metal.key].elevated} mg/L).`);
    }
  }
  const askForMetals = values.hardnessEndpoint === "blurred" && !hasMetalReading(readings);
  const productById = new Map(products.map((p) => [String(p.id), p]));
  const acidGiven = lines.some((l) => productById.get(l.productId)?.category === "ph_decreaser");
  const phHigh = readings.ph !== undefined && readings.ph > DEFAULT_ANALYTE_RANGES.ph.high;

  const updateLine = (key: number, change: Partial<Line>) =>
    setLines((all) =>
      all.map((l) => {
        if (l.key !== key) return l;
        const next = { ...l, ...change };
        // A newly chosen product brings its own dose unit, which is also the unit it is costed in.
        if (change.productId !== undefined) next.unit = productById.get(change.productId)?.doseUnit ?? "";
        return next;
      }),
    );

  const numberInput = (name: string, label: string, unit: string) => (
    <label key={name} className="block">
      <span className="text-sm font-medium">
        {label}
        {unit ? <span className="font-normal text-muted"> ({unit})</span> : null}
      </span>
      <input
        name={name}
        inputMode="decimal"
        autoComplete="off"
        value={values[name] ?? ""}
        onChange={(e) => set(name)(e.target.value)}
        aria-invalid={Boolean(errors[name])}
        aria-describedby={errors[name] ? `${name}-error` : undefined}
        className={bigInput}
      />
      {errors[name] ? (
        <span id={`${name}-error`} className="mt-1 block text-sm text-alert">
          {errors[name]}
        </span>
      ) : null}
    </label>
  );

  return (
    <Form method="post" className="space-y-6 pb-28" noValidate>
      <input type="hidden" name="submissionKey" value={submissionKey} />
      <section aria-labelledby="readings" className="space-y-3">
        <h2 id="readings" className="text-lg font-semibold">Readings</h2>
        <p className="text-sm text-muted">Fill in what you tested; leave the rest empty.</p>
        <div className="grid grid-cols-2 gap-3">
          {NUMERIC_ANALYTES.map((a) => numberInput(a.key, a.label, a.unit))}
          <div className="col-span-2 grid grid-cols-[1fr_auto] items-end gap-2">
            {numberInput("temperature", "Water temperature", values.temperatureUnit === "F" ? "°F" : "°C")}
            <fieldset className="flex overflow-hidden rounded-lg border border-line">
              <legend className="sr-only">Temperature unit</legend>
              {(["C", "F"] as const).map((u) => (
                <label key={u} className="flex min-h-12 cursor-pointer items-center px-4 has-checked:bg-verdigris-700 has-checked:text-white">
                  <input
                    type="radio"
                    name="temperatureUnit"
                    value={u}
                    checked={values.temperatureUnit === u}
                    onChange={() => set("temperatureUnit")(u)}
                    className="sr-only"
                  />
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
        <Choice name="hardnessEndpoint" legend="Hardness test endpoint" labels={ENDPOINT_LABELS} value={values.hardnessEndpoint ?? ""} onChange={set("hardnessEndpoint")} />
        {askForMetals ? (
          <p role="status" className="rounded-lg border border-calm bg-blue-50 p-3 text-sm">
            A blurred endpoint often means dissolved metals. Please test copper, iron and manganese now if you can; the pool
            will be marked “metal suspected” until a metal reading is logged.
          </p>
        ) : null}
        <Choice name="stain" legend="Visible stain" labels={STAIN_LABELS} value={values.stain ?? ""} onChange={set("stain")} />
        {values.stain === "new" || values.stain === "existing" ? (
          <Choice name="stainColour" legend="Stain colour" labels={STAIN_COLOUR_LABELS} value={values.stainColour ?? ""} onChange={set("stainColour")} />
        ) : null}
        <Choice name="padTint" legend="Metal-collector pad" labels={PAD_TINT_LABELS} value={values.padTint ?? ""} onChange={set("padTint")} />
        <label className="block">
          <span className="text-sm font-medium">Note</span>
          <textarea name="note" rows={2} maxLength={2000} className={bigInput} aria-invalid={Boolean(errors.note)} />
          {errors.note ? <span className="mt-1 block text-sm text-alert">{errors.note}</span> : null}
        </label>
      </section>

      <section aria-labelledby="treatments" className="space-y-3">
        <h2 id="treatments" className="text-lg font-semibold">Treatments given</h2>
        {lines.map((line, i) => {
          const product = productById.get(line.productId);
          const amount = Number(line.amount.replace(",", "."));
          const cost =
            product?.unitCost != null && product.doseUnit && line.unit.toLowerCase() === product.doseUnit.toLowerCase() && amount > 0
              ? amount * product.unitCost
              : null;
          return (
            <div key={line.key} className="grid grid-cols-2 gap-2 rounded-xl border border-line bg-white p-3">
              <label className="col-span-2 block">
                <span className="text-sm font-medium">Product {i + 1}</span>
                <select
                  name="treatmentProduct"
                  value={line.productId}
                  onChange={(e) => updateLine(line.key, { productId: e.target.value })}
                  className={bigInput}
                  aria-invalid={Boolean(errors[`treatments.${i}.product`])}
                >
                  <option value="">None</option>
                  {products.map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name}
                    </option>
                  ))}
                </select>
                {errors[`treatments.${i}.product`] ? <span className="mt-1 block text-sm text-alert">{errors[`treatments.${i}.product`]}</span> : null}
              </label>
              <label className="block">
                <span className="text-sm font-medium">Amount</span>
                <input
                  name="treatmentAmount"
                  inputMode="decimal"
                  value={line.amount}
                  onChange={(e) => updateLine(line.key, { amount: e.target.value })}
                  className={bigInput}
                  aria-invalid={Boolean(errors[`treatments.${i}.amount`])}
                />
              </label>
              <label className="block">
                <span className="text-sm font-medium">Unit</span>
                <input name="treatmentUnit" value={line.unit} maxLength={16} onChange={(e) => updateLine(line.key, { unit: e.target.value })} className={bigInput} />
              </label>
              {errors[`treatments.${i}.amount`] ? <span className="col-span-2 text-sm text-alert">{errors[`treatments.${i}.amount`]}</span> : null}
              {errors[`treatments.${i}.unit`] ? <span className="col-span-2 text-sm text-alert">{errors[`treatments.${i}.unit`]}</span> : null}
              {cost !== null ? <span className="col-span-2 text-sm text-muted">Cost {cost.toFixed(2)}</span> : null}
            </div>
          );
        })}
        <button
          type="button"
          onClick={() => setLines((all) => [...all, { key: (all.at(-1)?.key ?? 0) + 1, productId: "", amount: "", unit: "" }])}
          className="rounded-lg border border-line bg-white px-4 py-3 font-medium"
        >
          Add another treatment
        </button>
        {acidGiven || phHigh ? (
          <CautionNote topics={["acid"]}>
            {phHigh ? `pH ${readings.ph} is above ${DEFAULT_ANALYTE_RANGES.ph.high}; a pH decreaser is the usual step.` : "A pH decreaser is an acid."}
          </CautionNote>
        ) : null}
      </section>

      <FormProblem message={answer?.formError} />
      <div className="fixed inset-x-0 bottom-0 border-t border-line bg-paper/95 p-3 backdrop-blur">
        <button
          type="submit"
          disabled={busy}
          className="mx-auto block w-full max-w-xl rounded-xl bg-verdigris-700 px-4 py-4 text-lg font-semibold text-white disabled:opacity-60"
        >
          {busy ? "Saving…" : "Save visit"}
        </button>
      </div>
    </Form>
  );
}
