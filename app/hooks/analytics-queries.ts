import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import type { GroupFigures } from "~/.server/analytics/queries/group-figures";
import type { MetalTrend } from "~/.server/analytics/queries/metal-trend";
import type { RecurringReadings } from "~/.server/analytics/queries/recurring-pools";
import type { RouteBookSummary } from "~/.server/analytics/queries/route-book-summary";
import type { SharedSourceAlerts } from "~/.server/analytics/queries/shared-source-alerts";
import type { SourceHealthReport } from "~/.server/analytics/queries/source-health";
import type { TreatmentOutcomes } from "~/.server/analytics/queries/treatment-outcomes";
import { toSearch } from "~/lib/analytics/params";

export type AnalyticsSearch = Record<string, string | number | null | undefined>;

/** GETs one analytics endpoint; a refusal becomes an Error carrying the API's own message. */
async function fetchAnalytics<T>(path: string, search: string): Promise<T> {
  const response = await fetch(`${path}${search}`, { headers: { Accept: "application/json" } });
  const body = await response.json().catch(() => null);
  if (!response.ok) throw new Error(body?.error?.message ?? `The figures could not be loaded (${response.status}).`);
  return body as T;
}

/**
 * The queryOptions of one JSON endpoint: keyed by its path and its search in
 * a stable order; while a new search loads, the previous answer stays shown.
 */
function endpoint<T>(path: string) {
  return (params: AnalyticsSearch) => {
    const search = toSearch(params);
    return queryOptions({
      queryKey: [path, search] as const,
      queryFn: () => fetchAnalytics<T>(path, search),
      placeholderData: keepPreviousData,
    });
  };
}

/** One factory per endpoint the pages query. */
export const analyticsQueries = {
  summary: endpoint<RouteBookSummary>("/api/analytics/summary"),
  trend: endpoint<MetalTrend>("/api/analytics/trend"),
  alerts: endpoint<SharedSourceAlerts>("/api/analytics/alerts"),
  groups: endpoint<GroupFigures>("/api/analytics/groups"),
  outcomes: endpoint<TreatmentOutcomes>("/api/analytics/outcomes"),
  sources: endpoint<SourceHealthReport>("/api/analytics/sources"),
  recurringReadings: (params: AnalyticsSearch) => endpoint<RecurringReadings>("/api/analytics/recurring")({ ...params, include: "readings" }),
};

/**
 * An analytics page's `shouldRevalidate`: a new search is asked of the API
 * through the page's queries, so the loader runs again only on a new path.
 */
export function onlyOnNewPath({ currentUrl, nextUrl, defaultShouldRevalidate }: { currentUrl: URL; nextUrl: URL; defaultShouldRevalidate: boolean }) {
  return currentUrl.pathname !== nextUrl.pathname ? defaultShouldRevalidate : false;
}

/** The page's own search parameters in the loader, in the form the query keys carry. */
export function loaderSearch(request: Request, names: readonly string[]): string {
  const url = new URL(request.url);
  return toSearch(Object.fromEntries(names.map((n) => [n, url.searchParams.get(n) ?? undefined])));
}

/**
 * A page's figures from one endpoint, its cache seeded with the loader's
 * answer for the search the loader answered (so the first paint needs no
 * request, and works without scripts). A new search is asked of the API;
 * until it answers, the figures already shown stay.
 */
export function useSeededQuery<T>(options: ReturnType<ReturnType<typeof endpoint<T>>>, loader: { search: string; data: T }) {
  const query = useQuery({ ...options, initialData: options.queryKey[1] === loader.search ? loader.data : undefined });
  // Only after a remount on a search the loader did not answer is there nothing cached yet.
  return { data: query.data ?? loader.data, isFetching: query.isFetching, error: query.error };
}
