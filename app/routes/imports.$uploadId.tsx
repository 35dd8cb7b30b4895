import { useState } from "react";
import { data, Link, redirect, type RouterContextProvider, useFetcher } from "react-router";
import { requireArea } from "~/.server/guard";
import { checkUpload, saveMapping, savedMappings } from "~/.server/imports/check";
import { commitUpload } from "~/.server/imports/commit";
import type { PlanSummary } from "~/.server/imports/plan";
import { DELIMITER_NAMES, type Delimiter } from "~/.server/imports/read-file";
import { discardUpload, findUpload, uploadSample } from "~/.server/imports/uploads";
import { ProgressBar } from "~/components/imports/progress-bar";
import { useUploadProgress } from "~/hooks/use-upload-progress";
import { formatCount } from "~/lib/format";
import { COLUMN_UNITS, type ColumnMapping, type ColumnTarget, fieldLabel, IMPORT_FIELDS, unitsFor } from "~/lib/imports/fields";
import { readCheckForm } from "~/lib/imports/form";
import { hasNothingToStore, nothingToStoreMessage } from "~/lib/imports/nothing-to-store";
import { type HeaderConfidence, readHeader } from "~/lib/imports/propose-mapping";
import { readImportOptions } from "~/lib/imports/options";
import { uploadIdParams } from "~/lib/imports/params";
import type { Route } from "./+types/imports.$uploadId";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.upload.fileName ?? "Upload"} · Imports · Patina` }];

const notFound = () => data("No upload with that id in your company.", { status: 404 });

async function loadUpload(context: Readonly<RouterContextProvider>, params: unknown) {
  const scope = requireArea(context, "imports");
  const parsed = uploadIdParams.safeParse(params);
  if (!parsed.success) throw notFound();
  const upload = await findUpload(scope, parsed.data.uploadId);
  if (!upload) throw notFound();
  return { scope, upload };
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const { scope, upload } = await loadUpload(context, params);
  const [sample, mappings] = await Promise.all([uploadSample(upload), savedMappings(scope)]);
  return {
    upload: {
      id: upload.id,
      fileName: upload.fileName,
      phase: upload.phase,
      rowsTotal: upload.rowsTotal ?? 0,
      delimiter: DELIMITER_NAMES[(upload.delimiter ?? ",") as Delimiter],
      error: upload.error,
      importBatchId: upload.importBatchId,
    },
    sample,
    // How sure each header's own reading is; shown while a column still holds that reading.
    headerReadings: sample.headers.map((header) => readHeader(header)),
    options: readImportOptions(upload.options),
    summary: (upload.summary as PlanSummary | null) ?? null,
    savedMappingNames: mappings.map((m) => m.name),
    timeZone: scope.timeZone,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { scope, upload } = await loadUpload(context, params);
  const formData = await request.formData();
  const { headers } = await uploadSample(upload, 0);
  const form = readCheckForm(formData, headers.length);
  if (!form.ok) return data({ ok: false as const, message: form.message, field: form.field }, { status: 400 });
  if (form.intent === "discard") {
    await discardUpload(scope, upload.id);
    throw redirect("/imports");
  }
  if (form.intent === "save-mapping") {
    const saved = await saveMapping(scope, upload.id, form.mappingName!, form.options);
    if (!saved.ok) return data({ ok: false as const, message: saved.message, field: "mappingName" }, { status: saved.status });
    return { ok: true as const, message: `Mapping "${form.mappingName}" saved; files with the same columns will use it.` };
  }
  const checked = await checkUpload(scope, upload.id, form.options);
  if (!checked.ok) return data({ ok: false as const, message: checked.message, field: "intent" }, { status: checked.status });
  if (form.intent === "check") return { ok: true as const, message: "Checked. Nothing has been stored yet." };
  const committed = await commitUpload(scope, upload.id);
  if (!committed.ok) return data({ ok: false as const, message: committed.message, field: "intent" }, { status: committed.status });
  throw redirect(`/imports?imported=${committed.batchId}`);
}

const CONFIDENCE_WORDS: Record<HeaderConfidence, string> = {
  exact: "Read from its name.",
  abbreviation: "Read from a short form of its name.",
  partial: "A guess from part of its name: check it.",
};

function ColumnRow({ index, header, examples, value, proposal, onChange }: {
  index: number;
  header: string;
  examples: string[];
  value: ColumnMapping;
  proposal: { field: ColumnTarget; confidence?: HeaderConfidence } | undefined;
  onChange: (next: ColumnMapping) => void;
}) {
  const confidence = proposal?.confidence && proposal.field === value.field ? proposal.confidence : null;
  const units = unitsFor(value.field);
  const selectId = `column-${index}`;
  return (
    <li className="grid grid-cols-1 gap-2 px-3 py-3 sm:grid-cols-[1fr_13rem_9rem] sm:items-center">
      <div>
        <label htmlFor={selectId} className="font-medium">{header || `(column ${index + 1})`}</label>
        <span className="block text-xs text-muted">{examples.filter(Boolean).slice(0, 3).join(" · ") || "empty in the first rows"}</span>
        {confidence ? (
          <span className={`block text-xs ${confidence === "partial" ? "font-medium" : "text-muted"}`} data-confidence={confidence}>
            {CONFIDENCE_WORDS[confidence]}
          </span>
        ) : null}
      </div>
      <select
        id={selectId}
        name={selectId}
        value={value.field}
        onChange={(event) => {
          const field = event.target.value as ColumnTarget;
          const allowed = unitsFor(field);
          onChange(allowed.length === 0 ? { field } : { field, unit: value.unit && allowed.includes(value.unit) ? value.unit : allowed[0] });
        }}
        className="w-full rounded-lg border border-line bg-white px-2 py-2"
      >
        {(["ignore", ...IMPORT_FIELDS] as ColumnTarget[]).map((target) => (
          <option key={target} value={target}>{fieldLabel(target)}</option>
        ))}
      </select>
      {units.length > 0 ? (
        <select
          aria-label={`Unit of ${header}`}
          name={`unit-${index}`}
          value={value.unit ?? units[0]}
          onChange={(event) => onChange({ ...value, unit: event.target.value as ColumnMapping["unit"] })}
          className="w-full rounded-lg border border-line bg-white px-2 py-2"
        >
          {units.map((unit) => (
            <option key={unit} value={unit}>{COLUMN_UNITS[unit]}</option>
          ))}
        </select>
      ) : (
        <span className="hidden text-muted sm:block" aria-hidden="true">no unit</span>
      )}
    </li>
  );
}

function Count({ label, value, tone = "ink" }: { label: string; value: number; tone?: "ink" | "alert" }) {
  return (
    <div>
      <dt className="text-muted">{label}</dt>
      <dd className={`text-xl font-semibold tabular-nums ${tone === "alert" && value > 0 ? "text-alert" : ""}`}>{formatCount(value)}</dd>
    </div>
  );
}

export default function ImportCheck({ loaderData }: Route.ComponentProps) {
  const { upload, sample, headerReadings, options, summary, savedMappingNames } = loaderData;
  const fetcher = useFetcher<typeof action>();
  const [columns, setColumns] = useState<ColumnMapping[]>(options?.columns ?? []);
  const [dirty, setDirty] = useState(false);
  // New options from the server (after a check): the form starts again from them.
  const [shownOptions, setShownOptions] = useState(options);
  if (shownOptions !== options) {
    setShownOptions(options);
    setColumns(options?.columns ?? []);
    setDirty(false);
  }
  const busy = fetcher.state !== "idle";
  const progress = useUploadProgress(upload.id, busy);
  const working = busy && progress.data && (progress.data.phase === "checking" || progress.data.phase === "committing") ? progress.data : null;
  const result = fetcher.data;
  const finding = summary?.dateOrder;
  const askDateOrder = finding && (finding.kind === "ambiguous" || finding.kind === "conflicting");
  const committed = upload.phase === "committed";
  const noDateColumn = !committed && !columns.some((c) => c.field === "sampledAt");
  const nothingToStore = summary !== null && hasNothingToStore(summary);

  return (
    <div className="space-y-6">
      <div>
        <p className="text-sm text-muted"><Link to="/imports" className="underline">Imports</Link></p>
        <h1 className="text-2xl font-semibold tracking-tight">Check “{upload.fileName}”</h1>
        <p className="text-muted">
          {formatCount(upload.rowsTotal)} rows · {upload.delimiter}-separated · {sample.encodingNote}
        </p>
      </div>
      {committed ? (
        <p role="status" className="rounded-lg border border-line bg-white p-3">This file has been imported. <Link to="/imports" className="underline">See the import history</Link>.</p>
      ) : null}
      {upload.error ? <p role="alert" className="rounded-lg border border-alert bg-white p-3 text-sm text-alert">{upload.error}</p> : null}
      {noDateColumn ? (
        <p role="alert" className="rounded-lg border border-alert bg-white p-3 text-sm">
          No column is read as the sample date. Choose the date column under Columns before checking: without a date every row is refused.
        </p>
      ) : null}

      <fetcher.Form
        method="post"
        className="space-y-6"
        onChange={(event) => {
          if ((event.target as unknown as HTMLInputElement).name !== "mappingName") setDirty(true);
        }}
      >
        <section aria-labelledby="columns-heading" className="space-y-2">
          <h2 id="columns-heading" className="text-lg font-semibold">Columns</h2>
          <p className="text-sm text-muted">
            Patina proposed what each column holds from its header. Change any of them; columns left out are not read.
          </p>
          <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
            {sample.headers.map((header, index) => (
              <ColumnRow
                key={index}
                index={index}
                header={header}
                examples={sample.rows.map((r) => r.cells[index] ?? "")}
                value={columns[index] ?? { field: "ignore" }}
                proposal={headerReadings[index]}
                onChange={(next) => {
                  setColumns((current) => current.map((c, i) => (i === index ? next : c)));
                  setDirty(true);
                }}
              />
            ))}
          </ul>
        </section>

        <fieldset className="space-y-2 rounded-xl border border-line bg-white p-4">
          <legend className="px-1 font-semibold">Date order</legend>
          {finding ? (
            <p className={`text-sm ${askDateOrder ? "text-alert" : "text-muted"}`}>
              {finding.kind === "iso" && "Dates are written year first (2024-05-31): nothing to choose."}
              {finding.kind === "known" && `Read as ${finding.order === "dmy" ? "day first" : "month first"}: ${finding.reason}.`}
              {finding.kind === "ambiguous" && `Choose the order: ${finding.reason}. Patina does not guess.`}
              {finding.kind === "conflicting" && `The file mixes both orders (${finding.reason}). Choose one; rows that do not fit it are refused.`}
              {finding.kind === "none" && "No date column is chosen yet."}
            </p>
          ) : (
            <p className="text-sm text-muted">Check the file to see how its dates are written.</p>
          )}
          <div className="flex flex-wrap gap-4 text-sm">
            {([["", "As found in the file"], ["dmy", "Day first (31/05/2024)"], ["mdy", "Month first (05/31/2024)"]] as const).map(([value, label]) => (
              <label key={value} className="flex items-center gap-2">
                <input type="radio" name="dateOrder" value={value} defaultChecked={(options?.dateOrder ?? "") === value} />
                {label}
              </label>
            ))}
          </div>
          <p className="text-xs text-muted">Times are read in the company's time zone ({loaderData.timeZone}); a date without a time is the start of that day.</p>
        </fieldset>

        {summary && summary.unknownPools.length > 0 ? (
          <section aria-labelledby="unknown-pools" className="space-y-2">
            <h2 id="unknown-pools" className="text-lg font-semibold">Pools Patina does not know ({formatCount(summary.unknownPools.length)})</h2>
            <p className="text-sm text-muted">Their rows are left out unless you tick the pool: it is then created from the file's account code, address and customer name.</p>
            <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
              {summary.unknownPools.map((pool) => (
                <li key={pool.key} className="px-4 py-2">
                  <label className="flex items-start gap-3">
                    <input type="checkbox" name="createPool" value={pool.key} defaultChecked={pool.create} className="mt-1" />
                    <span>
                      <span className="font-medium">{pool.accountCode ?? pool.address}</span>
                      {pool.accountCode && pool.address ? <span className="text-muted"> · {pool.address}</span> : null}
                      <span className="block text-muted">{formatCount(pool.rows)} rows, first at row {pool.firstRow}. Create this pool</span>
                    </span>
                  </label>
                </li>
              ))}
            </ul>
          </section>
        ) : null}

        {summary && summary.unknownProducts.length > 0 ? (
          <section aria-labelledby="unknown-products" className="space-y-2">
            <h2 id="unknown-products" className="text-lg font-semibold">Products not on your list</h2>
            <p className="text-sm text-muted">Tick a product to add it to the product list (category “other”, to be set later); otherwise its treatments are left out and the tests kept.</p>
            <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
              {summary.unknownProducts.map((product) => (
                <li key={product.key} className="px-4 py-2">
                  <label className="flex items-center gap-3">
                    <input type="checkbox" name="createProduct" value={product.key} defaultChecked={product.create} />
                    <span><span className="font-medium">{product.name}</span> <span className="text-muted">· {formatCount(product.rows)} treatments</span></span>
                  </label>
                </li>
              ))}
            </ul>
          </section>
        ) : null}

        {summary ? (
          <section aria-labelledby="preview" className="space-y-3">
            <h2 id="preview" className="text-lg font-semibold">What an import would store</h2>
            <dl className="grid grid-cols-2 gap-3 rounded-xl border border-line bg-white p-4 text-sm sm:grid-cols-3">
              <Count label="Water tests to add" value={summary.testsToAdd} />
              <Count label="Treatments to add" value={summary.treatmentsToAdd} />
              <Count label="Already stored (skipped)" value={summary.duplicates} />
              <Count label="Rows refused" value={summary.refusedRows} tone="alert" />
              <Count label="Rows for unknown pools (left out)" value={summary.leftOutUnknownPool} />
              <Count label="pH outside 6.0–9.0 (kept, worth a look)" value={summary.pHWarnings} />
            </dl>
            {summary.refusedSample.length > 0 ? (
              <div className="space-y-2">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <h3 className="font-semibold">Refused rows{summary.refusedRows > summary.refusedSample.length ? ` (first ${summary.refusedSample.length} problems)` : ""}</h3>
                  <a href={`/api/imports/${upload.id}/refused.csv`} className="text-sm font-medium text-verdigris-700 underline" download>
                    Download every refused row (CSV)
                  </a>
                </div>
                <div className="overflow-x-auto rounded-xl border border-line bg-white">
                  <table className="w-full text-left text-sm">
                    <thead className="border-b border-line text-muted">
                      <tr>
                        <th scope="col" className="px-3 py-2 font-medium">Row</th>
                        <th scope="col" className="px-3 py-2 font-medium">Column</th>
                        <th scope="col" className="px-3 py-2 font-medium">Value</th>
                        <th scope="col" className="px-3 py-2 font-medium">Reason</th>
                      </tr>
                    </thead>
                    <tbody className="divide-y divide-line">
                      {summary.refusedSample.map((r, i) => (
                        <tr key={i}>
                          <td className="px-3 py-2 tabular-nums">{r.row}</td>
                          <td className="px-3 py-2">{r.column}</td>
                          <td className="px-3 py-2 font-mono">{r.value || "(empty)"}</td>
                          <td className="px-3 py-2">{r.reason}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </div>
            ) : (
              <p className="text-sm text-muted">No row was refused.</p>
            )}
          </section>
        ) : (
          <p className="rounded-xl border border-line bg-white p-4 text-muted">Nothing checked yet: press “Check the file” to see what would be added, skipped and refused. Nothing is stored by a check.</p>
        )}

        {working ? (
          <ProgressBar
            label={working.phase === "checking" ? "Checking rows" : "Storing rows"}
            done={working.rowsDone}
            total={working.rowsTotal}
          />
        ) : null}
        {result ? (
          <p role={result.ok ? "status" : "alert"} className={`rounded-lg border bg-white p-3 text-sm ${result.ok ? "border-line" : "border-alert text-alert"}`}>
            {result.message}
          </p>
        ) : null}

        {!committed ? (
          <div className="flex flex-wrap items-end gap-3">
            <button type="submit" name="intent" value="check" disabled={busy} className="rounded-lg border border-verdigris-700 px-4 py-2 font-medium text-verdigris-900 hover:bg-verdigris-50 disabled:opacity-60">
              Check the file
            </button>
            {nothingToStore && !dirty ? null : (
              <button
                type="submit"
                name="intent"
                value="commit"
                disabled={busy || !summary || dirty || Boolean(askDateOrder && !options?.dateOrder)}
                className="rounded-lg bg-verdigris-700 px-4 py-2 font-medium text-white hover:bg-verdigris-900 disabled:opacity-60"
              >
                Import {summary ? `${formatCount(summary.testsToAdd)} tests and ${formatCount(summary.treatmentsToAdd)} treatments` : ""}
              </button>
            )}
            <button type="submit" name="intent" value="discard" disabled={busy} className="rounded-lg px-3 py-2 text-sm text-muted underline">
              Set this file aside
            </button>
            {dirty ? <p className="w-full text-sm text-muted">You changed a choice: check the file again before importing.</p> : null}
            {nothingToStore && !dirty ? <p role="status" className="w-full text-sm">{nothingToStoreMessage(summary)}</p> : null}
          </div>
        ) : null}

        <details className="rounded-xl border border-line bg-white p-4 text-sm">
          <summary className="cursor-pointer font-medium">Save these columns for files of the same shape</summary>
          <div className="mt-3 flex flex-wrap items-end gap-3">
            <label className="flex flex-col gap-1">
              <span>Name</span>
              <input name="mappingName" maxLength={120} className="rounded-lg border border-line px-2 py-1" placeholder="Old route sheets" />
            </label>
            <button type="submit" name="intent" value="save-mapping" disabled={busy} className="rounded-lg border border-line px-3 py-1 font-medium hover:bg-verdigris-50">
              Save mapping
            </button>
          </div>
          {savedMappingNames.length > 0 ? <p className="mt-2 text-muted">Saved: {savedMappingNames.join(", ")}. A saved mapping is used when a new file has exactly its columns.</p> : null}
        </details>
      </fetcher.Form>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
