import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { RecurringReadings } from "~/.server/queries/analytics/recurring-pools";
import { analyticsKey, fetchAnalytics, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/recurring";

/** /api/analytics/recurring?include=readings, keyed by its parameters; asked only while `enabled`. */
export function useRecurringReadings(params: AnalyticsSearch, enabled: boolean) {
  return useQuery({
    queryKey: analyticsKey(PATH, { ...params, include: "readings" }),
    queryFn: () => fetchAnalytics<RecurringReadings>(PATH, { ...params, include: "readings" }),
    enabled,
    placeholderData: keepPreviousData,
  });
}
