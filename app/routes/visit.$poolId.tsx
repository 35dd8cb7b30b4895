import { useEffect, useState, useSyncExternalStore } from "react";
import { data, redirect, type ShouldRevalidateFunctionArgs, useLocation } from "react-router";
import { requireArea } from "~/.server/guard";
import { activeProducts } from "~/.server/routebook/queries/products";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { visitPool } from "~/.server/visits/queries/visit-pool";
import type { ServiceRefusal } from "~/.server/command-result";
import { logVisit } from "~/.server/visits/commands/save-visit";
import { KeptVisitsPanel, NoSignalNotice } from "~/components/visit/kept-visits";
import { type VisitAnswer, VisitForm } from "~/components/visit/visit-form";
import { formatDateTime } from "~/lib/format";
import { formObject } from "~/lib/forms/fields";
import { parseVisitForm, TREATMENT_FIELDS, typedVisit } from "~/lib/forms/visit";
import { useKeptPages } from "~/lib/offline/keep-pages";
import { KEPT_FIELDS, type KeptVisit, keptVisit, keptVisitFrom, typedValuesOf } from "~/lib/offline/kept-visits";
import { sendVisit, useKeptVisitSender } from "~/lib/offline/send-visit";
import { visitPagesFor } from "~/lib/offline/visit-pages";
import { visitTime } from "~/lib/offline/visit-time";
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
    memberId: scope.userId,
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
  // A visit kept on the phone without signal is stored at the time it was saved there.
  const result = await logVisit(scope, poolId, parsed.value, visitTime(raw[KEPT_FIELDS.takenAt], new Date()));
  if (!result.ok) return refusedVisit(result, raw);
  throw redirect(`/pools/${result.poolId}?saved=${result.testId}`);
}

/**
 * With the page's script, every visit is kept on the phone first and sent from
 * there (app/lib/offline/send-visit.ts): without signal it waits on the day's
 * list and is sent when the signal returns, with the same submission key.
 */
export async function clientAction({ request, params, serverAction }: Route.ClientActionArgs) {
  const form = await request.clone().formData();
  const visit = keptVisitFrom(form, Number(params.poolId), new Date());
  if (!visit) return serverAction();
  return sendVisit(visit, serverAction, form.get(KEPT_FIELDS.resend) === "1");
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

/** The kept visit the list's "Fix and save again" opened, once read from the phone; null when none. */
function useVisitToFix(poolId: number): KeptVisit | null | "reading" {
  const fixKey = (useLocation().state as { fixKeptVisit?: unknown } | null)?.fixKeptVisit;
  const [visit, setVisit] = useState<KeptVisit | null | "reading">(typeof fixKey === "string" ? "reading" : null);
  useEffect(() => {
    if (typeof fixKey !== "string") return;
    let current = true;
    keptVisit(fixKey).then(
      (found) => current && setVisit(found && found.poolId === poolId ? found : null),
      () => current && setVisit(null),
    );
    return () => {
      current = false;
    };
  }, [fixKey, poolId]);
  return visit;
}

const neverChanges = () => () => {};
const newKey = () => crypto.randomUUID();

export default function VisitPool({ loaderData, actionData }: Route.ComponentProps) {
  const { pool, lastTest, products, thresholds, balanceBand, temperatureUnit, units, currency, timeZone, memberId } = loaderData;
  // The page may come from the phone's copy, drawn with an earlier key: each opening of the form takes a
  // new one in the browser (the server's key stays until hydration is done, and for a post without script).
  const [opened, setOpened] = useState(() => ({ poolId: pool.id, key: newKey() }));
  if (opened.poolId !== pool.id) setOpened({ poolId: pool.id, key: newKey() });
  const hydrated = useSyncExternalStore(neverChanges, () => true, () => false);
  const submissionKey = hydrated ? opened.key : loaderData.submissionKey;
  useKeptVisitSender(memberId);
  useKeptPages(visitPagesFor([pool.id], false));
  const toFix = useVisitToFix(pool.id);
  const answered = actionData && "fieldErrors" in actionData ? (actionData as VisitAnswer) : undefined;
  const fixing = toFix !== null && toFix !== "reading" ? toFix : null;
  const answer: VisitAnswer | undefined =
    answered ??
    (fixing?.answer
      ? { fieldErrors: fixing.answer.fieldErrors, formError: fixing.answer.formError, values: typedValuesOf(fixing, TREATMENT_FIELDS) }
      : undefined);
  const label = `${pool.street} · ${pool.customerName}`;
  return (
    <div className="mx-auto max-w-xl space-y-4">
      <NoSignalNotice />
      {fixing ? null : <KeptVisitsPanel memberId={memberId} timeZone={timeZone} poolId={pool.id} />}
      <div>
        <p className="text-sm text-muted">
          {pool.accountCode} · {pool.routeName ?? "no route"}
        </p>
        <h1 className="text-2xl font-semibold tracking-tight">{pool.street}</h1>
        <p className="mb-4 text-muted">
          {pool.customerName}
          {lastTest ? ` · last test ${formatDateTime(lastTest.sampledAt, timeZone)}` : " · first visit on record"}
        </p>
        {toFix === "reading" ? (
          <p className="text-muted">Opening the visit kept on this phone…</p>
        ) : (
          <VisitForm
            key={fixing ? fixing.key : pool.id}
            submissionKey={fixing ? fixing.key : submissionKey}
            products={products}
            thresholds={thresholds}
            balanceBand={balanceBand}
            temperatureUnit={temperatureUnit}
            dosing={{ volumeLitres: pool.volumeLitres, units, currency }}
            answer={answer}
            keptAs={{ poolLabel: label, memberId, takenAt: fixing?.fields.find(([name]) => name === KEPT_FIELDS.takenAt)?.[1] }}
          />
        )}
      </div>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
