import { readAnalyticsRequest } from "~/.server/analytics/request";
import { routeBookSummary } from "~/.server/analytics/queries/route-book-summary";
import { summaryQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.summary";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, window, thresholds, balanceBand } = await readAnalyticsRequest(request, context, "overview", summaryQuery, "api");
  return Response.json(await routeBookSummary(scope, { window, thresholds, metal: null, balanceBand }));
}
