import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { RouteBookSummary } from "~/.server/queries/analytics/route-book-summary";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/summary";

/** /api/analytics/summary, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useRouteBookSummary(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: RouteBookSummary }) {
  return useQuery({
    queryKey: analyticsKey(PATH, params),
    queryFn: () => fetchAnalytics<RouteBookSummary>(PATH, params),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
