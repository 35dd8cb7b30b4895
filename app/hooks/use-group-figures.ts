import { keepPreviousData, useQuery } from "@tanstack/react-query";
import type { GroupFigures } from "~/.server/queries/analytics/group-figures";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

const PATH = "/api/analytics/groups";

/** /api/analytics/groups, keyed by its parameters; the loader's answer is used while they are unchanged. */
export function useGroupFigures(params: AnalyticsSearch, initial: { params: AnalyticsSearch; data: GroupFigures }) {
  return useQuery({
    queryKey: analyticsKey(PATH, params),
    queryFn: () => fetchAnalytics<GroupFigures>(PATH, params),
    initialData: sameParams(params, initial.params) ? initial.data : undefined,
    placeholderData: keepPreviousData,
  });
}
