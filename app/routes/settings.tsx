import { Form } from "react-router";
import { METALS } from "@analysis/metals/reading";
import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { updateCompanySettings } from "~/.server/settings/commands/update-company-settings";
import { refusedAnswer } from "~/.server/command-result";
import { SaveFooter, SelectField, TextField } from "~/components/form-controls";
import { formObject } from "~/lib/forms/fields";
import { parseSettingsForm } from "~/lib/forms/settings";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/settings";

export const meta: Route.MetaFunction = () => [{ title: "Settings · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "settings");
  const prefs = await companyPreferences(scope);
  return {
    name: prefs.name,
    town: prefs.town,
    prefs,
    timeZones: ["UTC", ...Intl.supportedValuesOf("timeZone")],
    currencies: currencyOptions(),
  };
}

/** Every currency the server knows, by code and name; read on the server so the page's list is the one it checks against. */
function currencyOptions() {
  const names = new Intl.DisplayNames("en", { type: "currency" });
  return Intl.supportedValuesOf("currency").map((code) => ({ value: code, label: `${code} · ${names.of(code) ?? code}` }));
}

export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "settings");
  const parsed = parseSettingsForm(formObject(await request.formData()));
  if (!parsed.ok) {
    return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: "Some settings need a look; nothing was saved." });
  }
  await updateCompanySettings(scope, parsed.value);
  return { ok: true as const, fieldErrors: {}, formError: null };
}

export default function Settings({ loaderData, actionData }: Route.ComponentProps) {
  const { name, town, prefs, timeZones, currencies } = loaderData;
  const errors = actionData?.fieldErrors;
  return (
    <div className="max-w-2xl space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Company settings</h1>
        <p className="text-muted">
          {name}
          {town ? ` · ${town}` : ""}
        </p>
      </div>
      <Form method="post" className="space-y-6" noValidate>
        <section aria-labelledby="thresholds" className="space-y-3 rounded-xl border border-line bg-white p-4">
          <h2 id="thresholds" className="text-lg font-semibold">Metal levels (mg/L)</h2>
          <p className="text-sm text-muted">
            A reading at or above “elevated” opens a metal episode; only a reading below “clear” closes it. These are staining
            levels from common practice, not health limits.
          </p>
          {METALS.map((metal) => (
            <div key={metal} className="grid grid-cols-2 gap-3">
              <TextField name={`${metal}Elevated`} label={`${METAL_LABELS[metal]}: elevated at or above`} inputMode="decimal" defaultValue={prefs.thresholds[metal].elevated} errors={errors} />
              <TextField name={`${metal}Clear`} label={`${METAL_LABELS[metal]}: clear below`} inputMode="decimal" defaultValue={prefs.thresholds[metal].clear} errors={errors} />
            </div>
          ))}
        </section>
        <section aria-labelledby="balance" className="space-y-3 rounded-xl border border-line bg-white p-4">
          <h2 id="balance" className="text-lg font-semibold">Water balance</h2>
          <p className="text-sm text-muted">Saturation index counted as balanced between these values (common practice: −0.3 to +0.3).</p>
          <div className="grid grid-cols-2 gap-3">
            <TextField name="balanceLow" label="Balanced from" inputMode="decimal" defaultValue={prefs.balanceBand.low} errors={errors} />
            <TextField name="balanceHigh" label="Balanced up to" inputMode="decimal" defaultValue={prefs.balanceBand.high} errors={errors} />
          </div>
        </section>
        <section aria-labelledby="units" className="space-y-3 rounded-xl border border-line bg-white p-4">
          <h2 id="units" className="text-lg font-semibold">Units, time and currency</h2>
          <SelectField
            name="unitSystem"
            label="Units"
            defaultValue={prefs.units}
            options={[
              { value: "us", label: "US (gallons, °F)" },
              { value: "metric", label: "Metric (litres, °C)" },
            ]}
            errors={errors}
          />
          <SelectField
            name="timeZone"
            label="Time zone (decides which weekday's route is today)"
            defaultValue={prefs.timeZone}
            options={timeZones.map((z) => ({ value: z, label: z }))}
            errors={errors}
          />
          <SelectField name="currency" label="Currency (every cost is shown in it)" defaultValue={prefs.currency} options={currencies} errors={errors} />
        </section>
        {actionData?.ok ? (
          <p role="status" className="rounded-lg bg-verdigris-50 px-3 py-2 text-sm font-medium">
            Settings saved.
          </p>
        ) : null}
        <SaveFooter formError={actionData?.formError}>Save settings</SaveFooter>
      </Form>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
