import { useSearchParams } from "react-router";
import { GROUPING_KEYS, type GroupingKey } from "@analysis/stats/groups";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { groupFigures } from "~/.server/analytics/queries/group-figures";
import { FilterBar, QueryState, useSearchObject } from "~/components/analytics/filter-bar";
import { GroupRateChart } from "~/components/analytics/group-chart";
import { analyticsQueries, loaderSearch, onlyOnNewPath, useSeededQuery } from "~/hooks/analytics-queries";
import { GROUPING_LABELS } from "~/lib/analytics/labels";
import { groupsQuery } from "~/lib/analytics/params";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/risk";

export const meta: Route.MetaFunction = () => [{ title: "Risk groups · Patina" }];

const PARAMS = ["from", "to", "route", "metal", "grouping"] as const;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "risk", groupsQuery, "page");
  const figures = await groupFigures(scope, { window, thresholds, metal: query.metal ?? null, grouping: query.grouping as GroupingKey });
  return { search: loaderSearch(request, PARAMS), figures };
}

export const shouldRevalidate = onlyOnNewPath;

export default function Risk({ loaderData }: Route.ComponentProps) {
  const params = useSearchObject(PARAMS);
  const [search, setSearch] = useSearchParams();
  const query = useSeededQuery(analyticsQueries.groups(params), { search: loaderData.search, data: loaderData.figures });
  const figures = query.data;
  const grouping = figures.grouping;
  const overallRate = figures.poolYears > 0 ? figures.openings / figures.poolYears : null;
  const risky = figures.groups.filter((g) => g.risky);

  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold tracking-tight">Risk groups</h1>
        <p className="text-muted">Which fill sources, equipment, places or finishes go with more metal episodes than the rest of the route book.</p>
      </header>

      <fieldset className="rounded-xl border border-line bg-white p-4">
        <legend className="px-1 text-sm font-medium">Compare pools by</legend>
        <div className="flex flex-wrap gap-2">
          {GROUPING_KEYS.map((key) => (
            <button
              key={key}
              type="button"
              aria-pressed={key === grouping}
              onClick={() => {
                const next = new URLSearchParams(search);
                next.set("grouping", key);
                setSearch(next, { replace: true, preventScrollReset: true });
              }}
              className={`rounded-lg border px-3 py-2 text-sm font-medium ${key === grouping ? "border-verdigris-700 bg-verdigris-100 text-verdigris-900" : "border-line hover:bg-verdigris-50"}`}
            >
              {GROUPING_LABELS[key]}
            </button>
          ))}
        </div>
      </fieldset>
      <FilterBar metal />
      <QueryState isFetching={query.isFetching} error={query.error} />

      <p className="text-sm" aria-live="polite">
        {figures.metal ? METAL_LABELS[figures.metal] : "All metals"}: {figures.openings} episode openings over {figures.poolYears.toFixed(1)} pool-years on{" "}
        {figures.pools} pools.{" "}
        {risky.length === 0
          ? "No group is flagged risky."
          : `Flagged risky: ${risky.map((g) => g.label).join(", ")}.`}
      </p>

      <GroupRateChart groups={figures.groups} dimension={GROUPING_LABELS[grouping]} overallRate={overallRate} />

      <p className="text-xs text-muted">
        A pool's observed time runs from its first to its last test in the window; heater age and exchanger metal are read at the date of each
        test. Rate ratio: the group's rate over the rest of the route book's, with a conditional exact 95% interval. Risky: that interval's lower
        bound is above 1 and the group has at least 3 pools. Evidence of a pattern, not proof of a cause.
      </p>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
