import { readAnalyticsRequest } from "~/.server/analytics/request";
import { sharedSourceAlertList } from "~/.server/analytics/queries/shared-source-alerts";
import { alertsQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.alerts";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "sources", alertsQuery, "api");
  return Response.json(await sharedSourceAlertList(scope, { window, thresholds, metal: query.metal ?? null }));
}
