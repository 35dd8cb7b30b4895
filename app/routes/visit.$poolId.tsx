import { data, redirect, type ShouldRevalidateFunctionArgs } from "react-router";
import { requireArea } from "~/.server/guard";
import { activeProducts } from "~/.server/routebook/queries/products";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { visitPool } from "~/.server/visits/queries/visit-pool";
import type { ServiceRefusal } from "~/.server/command-result";
import { logVisit } from "~/.server/visits/commands/save-visit";
import { VisitForm } from "~/components/visit/visit-form";
import { formatDateTime } from "~/lib/format";
import { formObject } from "~/lib/forms/fields";
import { parseVisitForm, TREATMENT_FIELDS, typedVisit } from "~/lib/forms/visit";
import { idParam, notFoundPage } from "~/lib/route-params";
import type { Route } from "./+types/visit.$poolId";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `Visit ${loaderData?.pool.street ?? "pool"} · Patina` }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "visit");
  const poolId = idParam(params, "poolId", "pool");
  const [found, products, prefs] = await Promise.all([visitPool(scope, poolId), activeProducts(scope), companyPreferences(scope)]);
  if (!found) notFoundPage("No pool with that number is on your routes.");
  return {
    ...found,
    products,
    thresholds: prefs.thresholds,
    balanceBand: prefs.balanceBand,
    temperatureUnit: prefs.units === "us" ? ("F" as const) : ("C" as const),
    units: prefs.units,
    currency: prefs.currency,
    timeZone: prefs.timeZone,
    // One key per rendering of the form: a second submit of the same form is recognised and stored once.
    submissionKey: crypto.randomUUID(),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const scope = requireArea(context, "visit");
  const poolId = idParam(params, "poolId", "pool");
  const raw = formObject(await request.formData(), TREATMENT_FIELDS);
  const parsed = parseVisitForm(raw);
  if (!parsed.ok) return refusedVisit(parsed, raw);
  const result = await logVisit(scope, poolId, parsed.value, new Date());
  if (!result.ok) return refusedVisit(result, raw);
  throw redirect(`/pools/${result.poolId}?saved=${result.testId}`);
}

/**
 * A refused visit, with the values as typed: when the form was posted without
 * the page's script, the page is drawn again from them.
 */
function refusedVisit(refused: Pick<ServiceRefusal, "fieldErrors" | "formError"> & { status?: number }, raw: Record<string, unknown>) {
  return data(
    { ok: false as const, fieldErrors: refused.fieldErrors, formError: refused.formError, values: typedVisit(raw) },
    { status: refused.status ?? 400 },
  );
}

/** After a refused save, keep the form as typed (and its submission key). */
export function shouldRevalidate({ actionResult, defaultShouldRevalidate }: ShouldRevalidateFunctionArgs) {
  return actionResult?.ok === false ? false : defaultShouldRevalidate;
}

export default function VisitPool({ loaderData, actionData }: Route.ComponentProps) {
  const { pool, lastTest, products, thresholds, balanceBand, temperatureUnit, units, currency, timeZone, submissionKey } = loaderData;
  return (
    <div className="mx-auto max-w-xl">
      <p className="text-sm text-muted">
        {pool.accountCode} · {pool.routeName ?? "no route"}
      </p>
      <h1 className="text-2xl font-semibold tracking-tight">{pool.street}</h1>
      <p className="mb-4 text-muted">
        {pool.customerName}
        {lastTest ? ` · last test ${formatDateTime(lastTest.sampledAt, timeZone)}` : " · first visit on record"}
      </p>
      <VisitForm
        key={pool.id}
        submissionKey={submissionKey}
        products={products}
        thresholds={thresholds}
        balanceBand={balanceBand}
        temperatureUnit={temperatureUnit}
        dosing={{ volumeLitres: pool.volumeLitres, units, currency }}
        answer={actionData}
      />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
