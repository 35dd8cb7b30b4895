import { requireArea } from "~/.server/guard";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { sourceDetail } from "~/.server/routebook/queries/sources";
import { refusedAnswer } from "~/.server/command-result";
import { addSourceTest } from "~/.server/routebook/commands/sources";
import { ButtonLink, PageHeader } from "~/components/data-table";
import { SourceTestForm, SourceTestTable } from "~/components/routebook/source-tests";
import { TextLink } from "~/components/text-link";
import { todayIn } from "~/lib/dates";
import { formObject } from "~/lib/forms/fields";
import { parseSourceTestForm } from "~/lib/forms/routebook";
import { labelOf, SOURCE_KIND_LABELS } from "~/lib/labels";
import { roleMayOpen } from "~/lib/roles";
import { idParam, notFoundPage } from "~/lib/route-params";
import type { Route } from "./+types/sources.$sourceId";

export const meta: Route.MetaFunction = ({ loaderData }) => [{ title: `${loaderData?.detail.source.name ?? "Fill source"} · Patina` }];

export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "routebook");
  const [detail, prefs] = await Promise.all([sourceDetail(scope, idParam(params, "sourceId", "fill source")), companyPreferences(scope)]);
  if (!detail) notFoundPage("No fill source with that number in your company.");
  return { detail, today: todayIn(prefs.timeZone), mayEdit: roleMayOpen(scope.role, "routebookEdit") };
}

/** Records a test of the fill water. */
export async function action({ request, params, context }: Route.ActionArgs) {
  const scope = requireArea(context, "routebookEdit");
  const sourceId = idParam(params, "sourceId", "fill source");
  const parsed = parseSourceTestForm(formObject(await request.formData()));
  if (!parsed.ok) return refusedAnswer({ fieldErrors: parsed.fieldErrors, formError: null });
  const { timeZone } = await companyPreferences(scope);
  const result = await addSourceTest(scope, sourceId, parsed.value, todayIn(timeZone));
  if (!result.ok) return refusedAnswer(result);
  return { ok: true as const, fieldErrors: {}, formError: null, repeated: result.repeated };
}

export default function SourcePage({ loaderData, actionData }: Route.ComponentProps) {
  const { detail, today, mayEdit } = loaderData;
  const { source, pools, tests } = detail;
  return (
    <div className="space-y-6">
      <PageHeader title={source.name} action={mayEdit ? <ButtonLink to={`/sources/${source.id}/edit`}>Edit</ButtonLink> : null}>
        {labelOf(SOURCE_KIND_LABELS, source.kind)}
        {source.active ? "" : " · archived"}
        {source.notes ? ` · ${source.notes}` : ""}
      </PageHeader>
      <section aria-labelledby="source-tests" className="space-y-3">
        <h2 id="source-tests" className="text-lg font-semibold">Tests of this water</h2>
        <SourceTestTable tests={tests} />
        {mayEdit ? <SourceTestForm today={today} answer={actionData?.ok ? undefined : actionData} /> : null}
      </section>
      <section aria-labelledby="source-pools">
        <h2 id="source-pools" className="mb-2 text-lg font-semibold">Pools filled from it ({pools.length})</h2>
        {pools.length === 0 ? (
          <p className="text-muted">No pools on your routes are filled from this source.</p>
        ) : (
          <ul className="divide-y divide-line rounded-xl border border-line bg-white text-sm">
            {pools.map((p) => (
              <li key={p.id} className="flex flex-wrap justify-between gap-2 px-4 py-2">
                <TextLink to={`/pools/${p.id}`}>{p.street}</TextLink>
                <span className="text-muted">
                  {p.accountCode} · {p.routeName ?? "no route"}
                  {p.active ? "" : " · archived"}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
