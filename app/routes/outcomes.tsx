import { useState } from "react";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { treatmentOutcomes } from "~/.server/analytics/queries/treatment-outcomes";
import { FilterBar, FilterBarSelect, QueryState, useSearchObject } from "~/components/analytics/filter-bar";
import { ReductionChart, TimeToClearChart, type ArmView } from "~/components/analytics/outcome-charts";
import { CautionNote } from "~/components/caution-note";
import { TextLink } from "~/components/text-link";
import { analyticsQueries, loaderSearch, onlyOnNewPath, useSeededQuery } from "~/hooks/analytics-queries";
import { ARM_LABELS } from "~/lib/analytics/labels";
import { ARM_DIMENSIONS, outcomesQuery } from "~/lib/analytics/params";
import { formatDate, formatMoney } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/outcomes";

export const meta: Route.MetaFunction = () => [{ title: "Treatment outcomes · Patina" }];

const PARAMS = ["from", "to", "route", "metal", "arm"] as const;
const STRATA = { all: "All treatments", inside: "pH 7.2–7.6 at treatment", outside: "pH outside 7.2–7.6 at treatment" } as const;
type Stratum = keyof typeof STRATA;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds, currency } = await readAnalyticsRequest(request, context, "outcomes", outcomesQuery, "page");
  const outcomes = await treatmentOutcomes(scope, { window, thresholds, metal: query.metal, arm: query.arm });
  return { search: loaderSearch(request, PARAMS), timeZone: scope.timeZone, currency, outcomes };
}

export const shouldRevalidate = onlyOnNewPath;

const ARM_OPTIONS = ARM_DIMENSIONS.map((d) => ({ value: d, label: ARM_LABELS[d] }));

const percent = (n: number | null) => (n === null ? "—" : `${n.toFixed(0)} %`);

export default function Outcomes({ loaderData }: Route.ComponentProps) {
  const params = useSearchObject(PARAMS);
  const query = useSeededQuery(analyticsQueries.outcomes(params), { search: loaderData.search, data: loaderData.outcomes });
  const outcomes = query.data;
  const [stratum, setStratum] = useState<Stratum>("all");
  const arms: ArmView[] = outcomes.arms
    .map((a) => (stratum === "all" ? a : { ...a.byPh[stratum], label: a.label }))
    .filter((a) => a.courses > 0);

  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold tracking-tight">Treatment outcomes</h1>
        <p className="text-muted">
          Which metal treatments cleared {METAL_LABELS[outcomes.metal].toLowerCase()}, how fast, whether it stayed away, and what a cleared pool
          cost.
        </p>
      </header>
      <FilterBar metal anyMetal={false}>
        <FilterBarSelect name="arm" label="Compare by" options={ARM_OPTIONS} fallback="product" />
      </FilterBar>
      <fieldset className="flex flex-wrap gap-2">
        <legend className="sr-only">pH at treatment</legend>
        {(Object.keys(STRATA) as Stratum[]).map((s) => (
          <button
            key={s}
            type="button"
            aria-pressed={s === stratum}
            onClick={() => setStratum(s)}
            className={`rounded-lg border px-3 py-2 text-sm font-medium ${s === stratum ? "border-verdigris-700 bg-verdigris-100" : "border-line bg-white"}`}
          >
            {STRATA[s]}
          </button>
        ))}
      </fieldset>
      <QueryState isFetching={query.isFetching} error={query.error} />

      <p className="text-sm">
        {outcomes.courses} treatment courses (products applied within 3 days of each other count as one); {outcomes.eligibleCourses} started
        above the clear level and can show an effect.
      </p>

      <TimeToClearChart arms={arms} followUpDays={outcomes.rules.followUpDays} />
      <ReductionChart arms={arms} />

      <section aria-labelledby="arm-table" className="overflow-x-auto rounded-xl border border-line bg-white">
        <h2 id="arm-table" className="px-4 pt-3 font-semibold">
          Each treatment side by side ({STRATA[stratum].toLowerCase()})
        </h2>
        {arms.length === 0 ? (
          <p className="p-4 text-muted">No treatment course in this window and pH group started above the clear level.</p>
        ) : (
          <table className="mt-2 w-full text-left text-sm tabular-nums">
            <thead className="border-b border-line text-muted">
              <tr>
                <th scope="col" className="px-3 py-2 font-medium">Treatment</th>
                <th scope="col" className="px-3 py-2 font-medium">Pools</th>
                <th scope="col" className="px-3 py-2 font-medium">Median days to clear</th>
                <th scope="col" className="px-3 py-2 font-medium">Median fall</th>
                <th scope="col" className="px-3 py-2 font-medium">Came back within 90 days</th>
                <th scope="col" className="px-3 py-2 font-medium">Cost per cleared pool</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {arms.map((a) => (
                <tr key={a.label}>
                  <th scope="row" className="px-3 py-2 font-medium">
                    {a.label}
                    {a.tooFewToCompare ? <span className="block text-xs font-normal text-muted">too few to compare (under {outcomes.rules.minPoolsToCompare} pools)</span> : null}
                  </th>
                  <td className="px-3 py-2">{a.pools}</td>
                  <td className="px-3 py-2">{a.timeToClear.medianDays === null ? `not within ${outcomes.rules.followUpDays} days` : a.timeToClear.medianDays.toFixed(0)}</td>
                  <td className="px-3 py-2">{percent(a.reduction.median)}</td>
                  <td className="px-3 py-2">
                    {a.recurrence.followed === 0 ? "not followed long enough" : `${a.recurrence.recurred} of ${a.recurrence.followed}`}
                  </td>
                  <td className="px-3 py-2">
                    {a.costPerClearedPool === null ? "none cleared" : formatMoney(a.costPerClearedPool, loaderData.currency)}
                    {a.costComplete ? null : <span className="block text-xs text-muted">some costs not recorded</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section aria-labelledby="escalation" className="space-y-3 rounded-xl border border-line bg-white p-4">
        <h2 id="escalation" className="font-semibold">When more product is not helping</h2>
        {outcomes.escalation.length === 0 ? (
          <p className="text-muted">No pool has had three courses in a row that did not clear the metal.</p>
        ) : (
          <>
            <p className="text-sm">
              These pools had three or more courses in a row without clearing. Old, set-in stains do not respond to sequestrant or pads: find the
              cause, and consider a surface acid treatment or a drain and acid wash by a qualified contractor.
            </p>
            <ul className="divide-y divide-line text-sm">
              {outcomes.escalation.map((e) => (
                <li key={e.poolId} className="py-2">
                  <TextLink to={`/pools/${e.poolId}`}>{e.street}</TextLink>{" "}
                  · {e.coursesWithoutClearing} courses without clearing since {formatDate(e.since, loaderData.timeZone)}
                </li>
              ))}
            </ul>
            <CautionNote topics={["acid", "drain", "equipment"]} />
          </>
        )}
      </section>
      <p className="text-xs text-muted">
        Baseline: the reading at the treatment visit or in the 7 days before. Clear: below the company's clear level. The figures compare what
        happened, not a controlled trial; product, pool and season all play a part.
      </p>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
