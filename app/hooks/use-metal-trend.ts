import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { MetalTrend } from "~/.server/queries/analytics/metal-trend";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/trend";

/** /api/analytics/trend, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useMetalTrend(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: MetalTrend }) {
  return useQuery({
    queryKey: analyticsKey(PATH, params),
    queryFn: () => fetchAnalytics<MetalTrend>(PATH, params),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
