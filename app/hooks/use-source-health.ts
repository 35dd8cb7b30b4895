import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { SourceHealthReport } from "~/.server/queries/analytics/source-health";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/sources";

/** /api/analytics/sources, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useSourceHealth(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: SourceHealthReport }) {
  return useQuery({
    queryKey: analyticsKey(PATH, params),
    queryFn: () => fetchAnalytics<SourceHealthReport>(PATH, params),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
