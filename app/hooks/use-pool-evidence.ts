import { useQuery } from "@tanstack/react-query";
import type { PoolEvidence } from "~/.server/queries/analytics/pool-evidence";
import { analyticsKey, fetchAnalytics, sameParams, type AnalyticsSearch } from "./analytics-fetch";

/** /api/analytics/pools/:poolId/evidence, keyed by pool and parameters; the loader's answer first. */
export function usePoolEvidence(poolId: number, params: AnalyticsSearch, initial?: { params: AnalyticsSearch; data: PoolEvidence }) {
  const path = `/api/analytics/pools/${poolId}/evidence`;
  return useQuery({
    queryKey: analyticsKey(path, params),
    queryFn: () => fetchAnalytics<PoolEvidence>(path, params),
    initialData: initial && sameParams(params, initial.params) ? initial.data : undefined,
  });
}
