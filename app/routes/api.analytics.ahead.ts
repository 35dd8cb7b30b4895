import { readAnalyticsRequest } from "~/.server/analytics/request";
import { metalOutlookFor } from "~/.server/analytics/queries/metal-outlook";
import { outlookQuery } from "~/lib/analytics/params";
import type { Route } from "./+types/api.analytics.ahead";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { scope, query, thresholds, balanceBand } = await readAnalyticsRequest(request, context, "outlook", outlookQuery, "api");
  return Response.json(await metalOutlookFor(scope, { thresholds, balanceBand }, { metal: query.metal, limit: query.limit }));
}
