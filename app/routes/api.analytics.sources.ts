import { readAnalyticsRequest } from "~/.server/analytics/request";
import { sourceHealth } from "~/.server/analytics/queries/source-health";
import { sourceHealthQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.sources";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, window, thresholds } = await readAnalyticsRequest(request, context, "sources", sourceHealthQuery, "api");
  return Response.json(await sourceHealth(scope, { window, thresholds, metal: query.metal ?? null }));
}
