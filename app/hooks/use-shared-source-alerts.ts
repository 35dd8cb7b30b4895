import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { SharedSourceAlerts } from "~/.server/queries/analytics/shared-source-alerts";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/alerts";

/** /api/analytics/alerts, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useSharedSourceAlerts(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: SharedSourceAlerts }) {
  return useQuery({
    queryKey: analyticsKey(PATH, params),
    queryFn: () => fetchAnalytics<SharedSourceAlerts>(PATH, params),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
