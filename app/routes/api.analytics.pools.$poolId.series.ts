import { readAnalyticsRequest } from "~/.server/analytics/request";
import { apiError } from "~/.server/guard";
import { poolSeries } from "~/.server/analytics/queries/pool-series";
import { seriesQuery } from "~/lib/analytics/params";
import { poolIdParams } from "~/lib/params";
import type { Route } from "./+types/api.analytics.pools.$poolId.series";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "pools", seriesQuery, "api");
  const id = poolIdParams.safeParse(params);
  if (!id.success) throw apiError(400, "invalid_parameter", `poolId "${params.poolId}": ${id.error.issues[0]?.message}`, "poolId");
  const series = await poolSeries(scope, id.data.poolId, query.analyte, { window, thresholds, metal: null });
  if (!series) throw apiError(404, "not_found", `No pool ${id.data.poolId} in your scope.`);
  return Response.json(series);
}
