import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { RecurringReadings } from "~/.server/queries/analytics/recurring";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/recurring";

/** /api/analytics/recurring?include=readings, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useRecurringReadings(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: RecurringReadings }) {
  return useQuery({
    queryKey: analyticsKey(PATH, { ...params, include: "readings" }),
    queryFn: () => fetchAnalytics<RecurringReadings>(PATH, { ...params, include: "readings" }),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
