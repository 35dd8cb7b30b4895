import { readAnalyticsRequest } from "~/.server/analytics/request";
import { metalTrend } from "~/.server/analytics/queries/metal-trend";
import { trendQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.trend";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "overview", trendQuery, "api");
  return Response.json(await metalTrend(scope, window, query.metal ?? null, thresholds));
}
