import { Link } from "react-router";
import { METALS } from "@analysis/metals/reading";
import { readAnalyticsRequest } from "~/.server/analytics/request";
import { loadMetalDataset } from "~/.server/analytics/queries/metal-dataset";
import { metalTrend } from "~/.server/analytics/queries/metal-trend";
import { sharedSourceAlertList } from "~/.server/analytics/queries/shared-source-alerts";
import { routeBookSummary } from "~/.server/analytics/queries/route-book-summary";
import { BalanceChart, MetalTrendChart, OpenEpisodesChart } from "~/components/analytics/overview-charts";
import { FilterBar, QueryState, useSearchObject } from "~/components/analytics/filter-bar";
import { Stat } from "~/components/stat";
import { TextLink } from "~/components/text-link";
import { analyticsQueries, loaderSearch, onlyOnNewPath, useSeededQuery } from "~/hooks/analytics-queries";
import { GROUPING_LABELS } from "~/lib/analytics/labels";
import { summaryQuery } from "~/lib/analytics/params";
import { formatCount, formatDate } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import type { Route } from "./+types/overview";

export const meta: Route.MetaFunction = () => [{ title: "Overview · Patina" }];

const PARAMS = ["from", "to", "route"] as const;
const RISKY_SHOWN = 8;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, window, thresholds, balanceBand } = await readAnalyticsRequest(request, context, "overview", summaryQuery, "page");
  const params = { window, thresholds, metal: null, balanceBand };
  const dataset = await loadMetalDataset(scope, params);
  const [summary, trend, alerts] = await Promise.all([
    routeBookSummary(scope, params, dataset),
    metalTrend(scope, window, null, thresholds),
    sharedSourceAlertList(scope, params),
  ]);
  return { search: loaderSearch(request, PARAMS), timeZone: scope.timeZone, summary, trend, alerts };
}

export const shouldRevalidate = onlyOnNewPath;

export default function Overview({ loaderData }: Route.ComponentProps) {
  const params = useSearchObject(PARAMS);
  const { search, timeZone } = loaderData;
  const summaryQuery = useSeededQuery(analyticsQueries.summary(params), { search, data: loaderData.summary });
  const trendQuery = useSeededQuery(analyticsQueries.trend(params), { search, data: loaderData.trend });
  const alertsQuery = useSeededQuery(analyticsQueries.alerts(params), { search, data: loaderData.alerts });
  const [summary, trend, alerts] = [summaryQuery.data, trendQuery.data, alertsQuery.data];
  const openTotal = METALS.reduce((sum, m) => sum + summary.openEpisodes[m], 0);

  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold tracking-tight">Overview</h1>
        <p className="text-muted">Dissolved metals, water balance and risky groups across the route book.</p>
      </header>
      <FilterBar />
      <QueryState isFetching={summaryQuery.isFetching || trendQuery.isFetching} error={summaryQuery.error ?? trendQuery.error ?? alertsQuery.error} />

      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        <Stat label="Open metal episodes" value={formatCount(openTotal)} tone={openTotal > 0 ? "alert" : "calm"} />
        <Stat label="Pools with recurring metal" value={formatCount(summary.recurringPools)} hint="2 or more openings within a year" />
        <Stat label="Pools with a chronic episode" value={formatCount(summary.chronicPools)} hint="open for more than 60 days" />
        <Stat label="Metal tests in the window" value={formatCount(summary.counts.metalTests)} hint={`${formatCount(summary.counts.tests)} tests in all`} />
      </dl>

      <div className="grid gap-4 lg:grid-cols-2">
        <OpenEpisodesChart open={summary.openEpisodes} />
        <BalanceChart balance={summary.balance} />
      </div>

      <section aria-labelledby="risky" className="rounded-xl border border-line bg-white p-4">
        <h2 id="risky" className="font-semibold">Risky groups</h2>
        <p className="text-sm text-muted">
          A group is risky when its episode rate is higher than the rest of the route book's with 95% confidence (the rate ratio's lower
          bound is above 1) and it has at least 3 pools.
        </p>
        {summary.riskyGroups.length === 0 ? (
          <p className="mt-2 text-muted">No group stands out: no group's rate ratio is above 1 with confidence, or the groups that rise are too small to judge.</p>
        ) : (
          <ul className="mt-2 divide-y divide-line">
            {summary.riskyGroups.slice(0, RISKY_SHOWN).map((g) => (
              <li key={`${g.grouping}-${g.group}-${g.metal}`} className="py-2">
                <Link to={`/risk?grouping=${g.grouping}&metal=${g.metal}`} className="font-medium text-verdigris-700 underline">
                  {GROUPING_LABELS[g.grouping]}: {g.label}
                </Link>{" "}
                <span className="text-sm">
                  · {METAL_LABELS[g.metal]} · {g.openings} openings on {g.pools} pools · rate ratio{" "}
                  {g.rateRatio.estimate === null ? "not bounded" : g.rateRatio.estimate.toFixed(1)} (lower bound {g.rateRatio.lower?.toFixed(1) ?? "—"})
                </span>
              </li>
            ))}
          </ul>
        )}
        {summary.riskyGroups.length > RISKY_SHOWN ? (
          <p className="mt-2 text-sm">
            and {summary.riskyGroups.length - RISKY_SHOWN} more: compare them on the{" "}
            <TextLink to="/risk">risk page</TextLink>
            .
          </p>
        ) : null}
      </section>

      <section aria-labelledby="alerts" className="rounded-xl border border-line bg-white p-4">
        <h2 id="alerts" className="font-semibold">Recent shared-source alerts</h2>
        <p className="text-sm text-muted">At least 3 pools (and a quarter of the active pools) on one fill source opened an episode of the same metal within 21 days.</p>
        {alerts.alerts.length === 0 ? (
          <p className="mt-2 text-muted">No fill source set off an alert in this window.</p>
        ) : (
          <ul className="mt-2 divide-y divide-line">
            {alerts.alerts.slice(0, 6).map((a) => (
              <li key={`${a.fillSourceId}-${a.metal}-${a.firstOpeningAt}`} className="py-2 text-sm">
                <TextLink to="/sources/health">{a.sourceName}</TextLink>{" "}
                · {METAL_LABELS[a.metal]} · {a.poolCount} of {a.activePools} pools between {formatDate(a.firstOpeningAt, timeZone)} and{" "}
                {formatDate(a.lastOpeningAt, timeZone)}
              </li>
            ))}
          </ul>
        )}
      </section>

      <MetalTrendChart months={trend.months} />
      <p className="text-xs text-muted">Elevated and clear levels are the company's settings (staining levels from common practice, not health limits).</p>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
