import { data, redirect } from "react-router";
import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { poolForEdit } from "~/.server/routebook/queries/pools";
import { routeOptions } from "~/.server/routebook/queries/routes";
import { sourceOptions } from "~/.server/routebook/queries/sources";
import type { ServiceRefusal } from "~/.server/command-result";
import { fitEquipment, removeEquipment, savePool } from "~/.server/routebook/commands/pools";
import { PageHeader } from "~/components/data-table";
import { EquipmentPanel } from "~/components/routebook/equipment-panel";
import { PoolForm } from "~/components/routebook/pool-form";
import { todayIn } from "~/lib/dates";
import { formObject } from "~/lib/forms/fields";
import { parseEquipmentForm, parsePoolForm, parseRemovalForm } from "~/lib/forms/routebook";
import { idParam, notFoundPage } from "~/lib/route-params";
import type { Route } from "./+types/pools.$poolId.edit";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `Edit ${loaderData?.pool.street ?? "pool"} · Patina` }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebookEdit");
  const found = await poolForEdit(scope, idParam(params, "poolId", "pool"));
  if (!found) notFoundPage("No pool with that number in your company.");
  const [routes, sources, prefs] = await Promise.all([routeOptions(scope), sourceOptions(scope), companyPreferences(scope)]);
  return { ...found, routes, sources, units: prefs.units, today: todayIn(prefs.timeZone) };
}

const INTENTS = ["save-pool", "add-equipment", "replace-equipment", "remove-equipment"] as const;
type Intent = (typeof INTENTS)[number];

export async function action({ request, params, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const poolId = idParam(params, "poolId", "pool");
  const raw = formObject(await request.formData());
  const intent = (INTENTS as readonly string[]).includes(String(raw.intent)) ? (raw.intent as Intent) : null;
  if (!intent) {
    return data({ ok: false as const, intent: "", fieldErrors: { intent: `Intent: "${String(raw.intent ?? "")}" is not an action of this page.` }, formError: null }, { status: 400 });
  }
  const refuse = (refused: Pick<ServiceRefusal, "fieldErrors" | "formError"> & { status?: number }) =>
    data({ ok: false as const, intent, fieldErrors: refused.fieldErrors, formError: refused.formError }, { status: refused.status ?? 400 });
  const prefs = await companyPreferences(scope);
  const today = todayIn(prefs.timeZone);

  if (intent === "save-pool") {
    const parsed = parsePoolForm(raw, prefs.units);
    if (!parsed.ok) return refuse({ fieldErrors: parsed.fieldErrors, formError: null });
    const result = await savePool(scope, poolId, parsed.value);
    if (!result.ok) return refuse(result);
    throw redirect(`/pools/${poolId}`);
  }
  if (intent === "remove-equipment") {
    const parsed = parseRemovalForm(raw);
    if (!parsed.ok) return refuse({ fieldErrors: parsed.fieldErrors, formError: null });
    const result = await removeEquipment(scope, poolId, parsed.value.equipmentId, parsed.value.removedOn, today);
    if (!result.ok) return refuse(result);
    return { ok: true as const, intent, fieldErrors: {}, formError: null };
  }
  const parsed = parseEquipmentForm(raw);
  if (!parsed.ok) return refuse({ fieldErrors: parsed.fieldErrors, formError: null });
  let replacesId: number | null = null;
  if (intent === "replace-equipment") {
    const id = Number(raw.equipmentId);
    if (!Number.isInteger(id) || id <= 0) return refuse({ fieldErrors: { equipmentId: "Equipment: choose the item to replace." }, formError: null });
    replacesId = id;
  }
  const result = await fitEquipment(scope, poolId, parsed.value, today, replacesId);
  if (!result.ok) return refuse(result);
  return { ok: true as const, intent, fieldErrors: {}, formError: null, repeated: result.repeated };
}

export default function EditPool({ loaderData, actionData }: Route.ComponentProps) {
  const { pool, equipment, routes, sources, units, today } = loaderData;
  const poolAnswer = actionData?.intent === "save-pool" ? actionData : undefined;
  return (
    <div className="space-y-8">
      <PageHeader title={`Edit ${pool.street}`}>{pool.accountCode}</PageHeader>
      <PoolForm pool={pool} units={units} routes={routes} sources={sources} answer={poolAnswer} />
      <EquipmentPanel items={equipment} today={today} answer={actionData} />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
