import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { TreatmentOutcomes } from "~/.server/queries/analytics/treatment-outcomes";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/outcomes";

/** /api/analytics/outcomes, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useTreatmentOutcomes(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: TreatmentOutcomes }) {
  return useQuery({
    queryKey: analyticsKey(PATH, params),
    queryFn: () => fetchAnalytics<TreatmentOutcomes>(PATH, params),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
