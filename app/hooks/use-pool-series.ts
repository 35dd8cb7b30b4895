import { useQuery } from "@tanstack/react-query";
import type { PoolSeries } from "~/.server/queries/analytics/pool-series";
import { analyticsKey, fetchAnalytics, type AnalyticsSearch } from "./analytics-fetch";

/** /api/analytics/pools/:poolId/series for one analyte, keyed by pool and parameters. */
export function usePoolSeries(poolId: number, params: AnalyticsSearch & { analyte: string }, enabled = true) {
  const path = `/api/analytics/pools/${poolId}/series`;
  return useQuery({ queryKey: analyticsKey(path, params), queryFn: () => fetchAnalytics<PoolSeries>(path, params), enabled });
}
